/** Bodies of the compute routes and of link saves. The link itself is LinkSpec (link.ts). */
import { z } from 'zod'
import { LinkSpec } from './link'
import { LinkDraftSpec } from './linkDraft'
import { Version } from './project'

/** A saved link may still have values to enter (a draft): see linkDraft.ts. */
export const LinkCreateBody = z.object({ spec: LinkDraftSpec })
export const LinkPatchBody = z.object({ version: Version, spec: LinkDraftSpec })

/** Most trials a spread study may run in one request. */
export const SPREAD_TRIALS_MAX = 100_000

/** Options of the pull-up sweep (timing-model.md section 5). */
export const PullupSweepOptions = z
  .object({
    series: z.enum(['E12', 'E24', 'E96'], { error: 'series must be E12, E24 or E96' }),
    /** pull-up range, ohms (inclusive) */
    rlMin: z.number({ error: 'rlMin must be a number' }).min(1, 'rlMin must be at least 1 ohm').max(10e6, 'rlMin must be at most 10 Mohm'),
    rlMax: z.number({ error: 'rlMax must be a number' }).min(1, 'rlMax must be at least 1 ohm').max(10e6, 'rlMax must be at most 10 Mohm'),
    /** IC available / IC needed that the LED current must give */
    overdrive: z.number().min(1, 'overdrive must be at least 1').max(100, 'overdrive must be at most 100').optional(),
    /** baud at which each row's margin is computed (default: the link's baud) */
    targetBaud: z.number().min(1, 'targetBaud must be at least 1').max(100e6, 'targetBaud must be at most 100e6').optional(),
  })
  .refine((o) => o.rlMin <= o.rlMax, { message: 'rlMin must not exceed rlMax', path: ['rlMin'] })
export type PullupSweepOptions = z.infer<typeof PullupSweepOptions>

export const PullupSweepBody = z.object({
  link: LinkSpec,
  channelId: z.string({ error: 'channelId is required' }).min(1, 'channelId is required').max(32),
  stageIndex: z.number({ error: 'stageIndex is required' }).int('stageIndex must be an integer').min(0, 'stageIndex must be at least 0').max(23),
  options: PullupSweepOptions,
})

/** The spread study's own options: the form checks them with this schema, the server with SpreadBody. */
export const SpreadOptions = z.object({
  trials: z
    .number({ error: 'trials is required' })
    .int('trials must be an integer')
    .min(1, 'trials must be at least 1')
    .max(SPREAD_TRIALS_MAX, `trials must be at most ${SPREAD_TRIALS_MAX}`),
  seed: z.number({ error: 'seed is required' }).int('seed must be an integer').min(0, 'seed must be at least 0').max(2 ** 32 - 1, 'seed must be below 2^32'),
  /** how a stage's delay is drawn within its corners (default uniform) */
  distribution: z.enum(['uniform', 'normal']).optional(),
  /** histogram bins (default 40) */
  bins: z.number().int('bins must be an integer').min(1, 'bins must be at least 1').max(1000, 'bins must be at most 1000').optional(),
})
export const SpreadBody = SpreadOptions.extend({ link: LinkSpec })
