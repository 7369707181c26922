import { signOffOf } from '../../domain/sign-offs'
import { presentLink } from '../../presenters/workspace'

/** A link with its spec, version, last editor, the caller's role, and its latest sign-off (changed since?). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link, role } = await requireLink(event, linkId, 'link.read')
  return presentLink(link, role, await signOffOf(link))
})
