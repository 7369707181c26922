import { PullupSweepBody } from '../../../shared/schemas/analyze'
import { sweepPullup } from '../../timing'

/** Pull-up sweep of one phototransistor stage {link, channelId, stageIndex, options}: signed in, any role. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { link, channelId, stageIndex, options } = await validBody(event, PullupSweepBody)
  return sweepPullup(link, channelId, stageIndex, options)
})
