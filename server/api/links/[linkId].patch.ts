import { LinkPatchBody } from '../../../shared/schemas/analyze'
import { updateLink } from '../../domain/links'
import { signOffOf } from '../../domain/sign-offs'
import { presentLink } from '../../presenters/workspace'

/** Save a link {version, spec} (engineer, admin). 409 {currentVersion, link} when `version` is stale. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link, role, user } = await requireLink(event, linkId, 'link.update')
  const { version, spec } = await validBody(event, LinkPatchBody)
  const saved = await updateLink(link, role, user.id, version, spec)
  return presentLink(saved, role, await signOffOf(saved))
})
