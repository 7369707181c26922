import { LinkSpec } from '../../../shared/schemas/link'
import { analyzeParsedLink } from '../../timing'

/** Analyse an unsaved link (the body is a link): signed in, any role; reads no stored data. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const link = await validBody(event, LinkSpec)
  return analyzeParsedLink(link)
})
