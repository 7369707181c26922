import { deleteLink } from '../../domain/links'

/** Delete a link (engineer, admin). */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link, user } = await requireLink(event, linkId, 'link.delete')
  await deleteLink(link, user.id)
  return sendNoContent(event, 204)
})
