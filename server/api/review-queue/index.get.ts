import { reviewQueue } from '../../domain/reports'
import { presentQueueItem } from '../../presenters/report'

/** Submitted revisions waiting for the caller in the teams where they review (named to them first). */
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return (await reviewQueue(user.id)).map((r) => presentQueueItem(r, user.id))
})
