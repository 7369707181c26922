import { presentPart } from '../../presenters/workspace'

/** A built-in part or one of the caller's team's parts. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { partId } = await validParams(event, idParams('partId'))
  const { part } = await requirePart(event, partId, 'part.read')
  return presentPart(part)
})
