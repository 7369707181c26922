/** Capture and datasheet DTOs (shared/types/capture.ts) from models. */
import type { CaptureDetailDto, CaptureDto, DatasheetDto } from '../../shared/types/capture'
import { summariseCaptureResult } from '../../shared/utils/capture-summary'
import type { Capture, PartDatasheet } from '../db/models'

type WithOwner = { owner?: { id: number; name: string } | null }

/** A capture as lists carry it: the measurement's summary (read from its own column when the full result was not loaded). */
export function presentCapture(c: Capture & WithOwner): CaptureDto {
  return {
    id: c.id,
    linkId: c.linkId,
    label: c.label,
    fileName: c.fileName,
    size: Number(c.size),
    contentType: c.contentType,
    sha256: c.sha256,
    options: c.options,
    status: c.status,
    progress: c.progress,
    error: c.error ?? null,
    result: c.summary ?? (c.result ? summariseCaptureResult(c.result) : null),
    owner: c.owner ? { id: c.owner.id, name: c.owner.name } : null,
    createdAt: c.createdAt.toISOString(),
  }
}

/** One capture with its whole measurement. */
export function presentCaptureDetail(c: Capture & WithOwner): CaptureDetailDto {
  return { ...presentCapture(c), result: c.result ?? null }
}

export function presentDatasheet(d: PartDatasheet & WithOwner): DatasheetDto {
  return {
    id: d.id,
    partId: d.partId,
    fileName: d.fileName,
    size: Number(d.size),
    sha256: d.sha256,
    owner: d.owner ? { id: d.owner.id, name: d.owner.name } : null,
    createdAt: d.createdAt.toISOString(),
  }
}
