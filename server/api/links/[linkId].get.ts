import { presentLink } from '../../presenters/workspace'

/** A link with its spec, version, last editor and the caller's role. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link, role } = await requireLink(event, linkId, 'link.read')
  return presentLink(link, role)
})
