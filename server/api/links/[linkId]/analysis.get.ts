import { requireCompleteSpec } from '../../../domain/analysis'
import { analyzeParsedLink } from '../../../timing'

/** The saved link's full analysis, computed now by the current engine (any member); 409 while values are missing. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link } = await requireLink(event, linkId, 'link.read')
  return analyzeParsedLink(requireCompleteSpec(link.spec, 'analysed'))
})
