import type { CaptureResult } from '../../server/captures/analyse'
import type { CaptureWaveform } from '../../server/captures/downsample'
import type { CaptureOptions, CaptureStatus } from '../schemas/capture'

export type { CaptureResult, CaptureWaveform }

/** A capture as the API returns it (never the waveform: that is its own route). */
export interface CaptureDto {
  id: number
  linkId: number
  label: string
  /** the uploaded file's name, for display only (the storage key is the server's) */
  fileName: string
  /** bytes */
  size: number
  contentType: string
  /** hex SHA-256 of the stored bytes */
  sha256: string
  options: CaptureOptions
  status: CaptureStatus
  /** 0..1 while the extraction runs */
  progress: number
  /** why the capture could not be read (names the line when one is at fault) */
  error: string | null
  /** the measurement, once status is done */
  result: CaptureResult | null
  owner: { id: number; name: string } | null
  createdAt: string
}

export interface DatasheetDto {
  id: number
  partId: number
  fileName: string
  size: number
  sha256: string
  owner: { id: number; name: string } | null
  createdAt: string
}
