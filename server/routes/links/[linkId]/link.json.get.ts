import { LinkSpec } from '../../../../shared/schemas/link'

/** The link's saved definition as link JSON (shared schema, with schemaVersion), ready to import. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link } = await requireLink(event, linkId, 'link.read')
  sendAs(event, 'application/json; charset=utf-8', `${fileSlug(link.name)}.json`)
  return JSON.stringify(LinkSpec.parse(link.spec), null, 2) + '\n'
})
