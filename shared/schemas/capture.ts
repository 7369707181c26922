import { z } from 'zod'
import { cleanText } from './text'

/** Upload limits, stated in the UI and enforced by the server (bytes). */
export const CAPTURE_MAX_BYTES = 48 * 1024 * 1024
export const DATASHEET_MAX_BYTES = 20 * 1024 * 1024

export const CaptureStatus = z.enum(['queued', 'running', 'done', 'failed'])
export type CaptureStatus = z.infer<typeof CaptureStatus>

const formBoolean = z.preprocess((v) => (v === 'true' ? true : v === 'false' ? false : v === '' ? undefined : v), z.boolean().optional())
const formChannel = z.preprocess((v) => (v === '' || v === undefined ? undefined : Number(v)), z.number().int('must be a whole number').min(1, 'channels count from 1').max(8, 'at most 8 channels').optional())
const formOhms = z.preprocess((v) => (v === '' || v === undefined ? undefined : Number(v)), z.number().positive('must be positive').max(1e9, 'is out of range').optional())

/**
 * The text fields of a capture upload (multipart form). Channels are 1-based as the
 * user sees them (the first voltage column is channel 1).
 */
export const CaptureUploadFields = z.object({
  label: cleanText(z.string().trim().max(200, 'label is at most 200 characters'), 'label').optional(),
  /** the path's input channel (default 1) */
  inputChannel: formChannel,
  /** the path's output channel (default 2 when the capture has two or more) */
  outputChannel: formChannel,
  /** whether the path inverts; detected from the edges when not given */
  inverting: formBoolean,
  /** the pull-up RL the capture was taken at, ohms (for a characterisation point) */
  rl: formOhms,
})
export type CaptureUploadFields = z.infer<typeof CaptureUploadFields>

/** Stored with the capture: what the extraction job is told. Channels 0-based. */
export interface CaptureOptions {
  input?: number
  output?: number
  inverting?: boolean
  rl?: number
}

/** GET /api/captures/:id/waveform: the plot's width in pixels; at most this many min/max columns come back. */
export const WaveformQuery = z.object({
  width: z.coerce.number().int('width must be an integer').min(50, 'width must be at least 50').max(4000, 'width must be at most 4000').optional(),
})
