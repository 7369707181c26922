import { SpreadBody } from '../../../shared/schemas/analyze'
import { spreadStudy } from '../../timing'

/** Seeded spread study {link, trials <= 100000, seed, distribution?, bins?}: signed in, any role. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { link, ...options } = await validBody(event, SpreadBody)
  return spreadStudy(link, options)
})
