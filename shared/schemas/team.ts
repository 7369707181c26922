/** Request bodies of the team routes (members, invitations). */
import { z } from 'zod'
import { Email } from './auth'
import { Role } from './roles'

export const MemberRoleBody = z.object({ role: Role })
export const InvitationBody = z.object({ email: Email, role: Role })
export type InvitationBody = z.infer<typeof InvitationBody>

/**
 * The team's engineering policy (issue 17): never 0 by default. New links take their
 * required margin and slack from it; the screens mark a margin or slack below its thin
 * threshold amber (with the threshold shown); a recommended sweep row keeps the guard band
 * above the required margin or is shown amber.
 */
export const TeamPolicy = z.object({
  /** required UART margin of new links, unit intervals */
  requiredMarginUi: z.number({ error: 'requiredMarginUi must be a number' }).gt(0, 'requiredMarginUi must be above 0').max(0.5, 'requiredMarginUi must be at most 0.5').default(0.1),
  /** required SPI slack of new links, as a fraction of the half period */
  requiredSlackFraction: z.number({ error: 'requiredSlackFraction must be a number' }).gt(0, 'requiredSlackFraction must be above 0').max(0.9, 'requiredSlackFraction must be at most 0.9').default(0.1),
  /** SPI slack below this fraction of the half period reads thin (amber) even when it meets the requirement */
  thinSlackFraction: z.number({ error: 'thinSlackFraction must be a number' }).min(0, 'thinSlackFraction must be at least 0').max(0.9, 'thinSlackFraction must be at most 0.9').default(0.2),
  /** UART margin above the requirement a result needs to read healthy, and a recommended sweep row to keep, unit intervals */
  guardBandUi: z.number({ error: 'guardBandUi must be a number' }).min(0, 'guardBandUi must be at least 0').max(0.5, 'guardBandUi must be at most 0.5').default(0.05),
})
export type TeamPolicy = z.infer<typeof TeamPolicy>

/** The policy of a team that never set one. */
export const DEFAULT_TEAM_POLICY: TeamPolicy = TeamPolicy.parse({})

export const TeamPolicyBody = z.object({ version: z.number({ error: 'version is required' }).int().min(1), policy: TeamPolicy })
