/**
 * Request schemas of margin reports (issue 6): freeze, submit, decisions, comments.
 * The routes validate with these; the report page builds its requests from the same types.
 */
import { z } from 'zod'
import { cleanText } from './text'

/** Review states of a revision (product.md): draft, submitted, signed off, returned. */
export const REPORT_STATES = ['draft', 'submitted', 'signed-off', 'returned'] as const
export const ReportState = z.enum(REPORT_STATES)
export type ReportState = z.infer<typeof ReportState>

/** How each state reads in the UI, the PDF and the mails. */
export const REPORT_STATE_LABEL: Record<ReportState, string> = {
  draft: 'draft',
  submitted: 'submitted',
  'signed-off': 'signed off',
  returned: 'returned',
}

/** Revision label: 1 -> "r1". */
export const revisionLabel = (n: number) => `r${n}`

const ChannelRef = z.string().regex(/^[A-Za-z0-9_-]{1,32}$/, 'channelId: 1-32 letters, digits, - or _')
const Index = z.number({ error: 'index must be a number' }).int('index must be an integer').min(0, 'index must be at least 0').max(63, 'index must be at most 63')

/**
 * What a comment is about: the report as a whole, one UART bit of a channel, one SPI
 * check, or one stage of a channel. The server checks that the target exists in the
 * revision's result.
 */
export const CommentTarget = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('report') }),
  z.object({ kind: z.literal('bit'), channelId: ChannelRef, index: Index }),
  z.object({ kind: z.literal('check'), id: z.string().regex(/^[a-z-]{1,32}$/, 'check id: lower-case letters and -') }),
  z.object({ kind: z.literal('stage'), channelId: ChannelRef, index: Index }),
])
export type CommentTarget = z.infer<typeof CommentTarget>

const Body = cleanText(z.string({ error: 'comment must be text' }).trim().min(1, 'comment is required').max(4000, 'comment is at most 4000 characters'), 'comment')

/** Optional pull-up sweep recorded with a revision (UART links with a phototransistor stage). */
export const FreezePullup = z.object({
  channelId: ChannelRef,
  stageIndex: z.number().int().min(0).max(23),
  series: z.enum(['E12', 'E24', 'E96']).default('E12'),
  rlMin: z.number().positive('rlMin must be positive').max(1e9),
  rlMax: z.number().positive('rlMax must be positive').max(1e9),
  overdrive: z.number().positive().max(100).optional(),
})
export type FreezePullup = z.infer<typeof FreezePullup>

export const FreezeBody = z.object({
  /** the link version the caller looked at: a stale one is a 409 (someone saved since) */
  linkVersion: z.number().int().positive().optional(),
  pullup: FreezePullup.optional(),
})
export type FreezeBody = z.infer<typeof FreezeBody>

export const SubmitBody = z.object({
  reviewerId: z.number({ error: 'reviewerId must be a user id' }).int('reviewerId must be an integer').positive('reviewerId must be a user id'),
  /** the review-state version the caller saw */
  version: z.number().int().positive().optional(),
})
export type SubmitBody = z.infer<typeof SubmitBody>

export const SignOffBody = z.object({
  comment: Body.optional(),
  version: z.number().int().positive().optional(),
})
export type SignOffBody = z.infer<typeof SignOffBody>

export const ReturnBody = z.object({
  comment: Body,
  version: z.number().int().positive().optional(),
})
export type ReturnBody = z.infer<typeof ReturnBody>

export const CommentBody = z.object({
  body: Body,
  target: CommentTarget.default({ kind: 'report' }),
})
export type CommentBody = z.infer<typeof CommentBody>

/** The tables of a revision as CSV (GET /reports/:id/tables.csv?table=). */
export const REPORT_TABLES = ['bits', 'checks', 'candidates', 'standard-rates', 'rate-sweep', 'stages', 'pullup', 'bus-checks', 'i2c-levels', 'i2c-pullups', 'can-bit-timing', 'can-bus-length'] as const
export type ReportTable = (typeof REPORT_TABLES)[number]
export const ReportTablesQuery = z.object({ table: z.enum(REPORT_TABLES, { error: `table must be one of ${REPORT_TABLES.join(', ')}` }) })

/** GET /reports/:id/report.pdf: the paper size, and whether the browser saves it rather than shows it. */
export const ReportPdfQuery = z.object({ paper: z.enum(['a4', 'letter']).default('a4'), download: z.enum(['0', '1']).default('0') })
