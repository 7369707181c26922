/**
 * Captures and datasheets: uploads checked by their bytes, stored in object storage under
 * a server-chosen key, with their metadata row written afterwards. Nothing is left
 * half-stored: a failed storage write leaves no row, and a failed row write removes the
 * object again.
 */
import { createHash } from 'node:crypto'
import { Op } from 'sequelize'
import type { Page } from '../utils/paging'
import { CAPTURE_MAX_BYTES, DATASHEET_MAX_BYTES, type CaptureOptions, type CaptureUploadFields } from '../../shared/schemas/capture'
import { CaptureFormatError } from '../captures/errors'
import { parseCapture } from '../captures/parse'
import { isPdf, sniffText } from '../captures/sniff'
import { Capture, PartDatasheet, User, type Link, type Part } from '../db/models'
import { enqueueCaptureExtraction } from '../jobs/queue'
import { newObjectKey, useStorage } from '../storage/s3'
import { useDb } from '../utils/db'
import { InvalidError } from '../utils/errors'
import { audit } from './audit'

export interface UploadedFile {
  /** the client's file name (display only) */
  name: string
  data: Uint8Array
}

/** Bytes of a capture checked synchronously at upload; the job reads the rest. */
const UPLOAD_CHECK_BYTES = 1024 * 1024

const withOwner = { model: User, as: 'owner', attributes: ['id', 'name'] }

function mib(bytes: number) {
  return `${Math.round(bytes / 1024 / 1024)} MB`
}

function displayName(name: string) {
  // keep the last path segment, printable characters only: it is shown, never used as a key
  return (name.split(/[\\/]/).pop() || 'upload').replace(/[\u0000-\u001f\u007f]/g, '').slice(0, 255) || 'upload'
}

/**
 * Check a capture before anything is stored: its bytes must be text (no binary magic),
 * and its first megabyte must read as a capture (header, delimiter, rows). A malformed
 * line further on fails the extraction job with the line named.
 */
export async function checkCaptureBytes(data: Uint8Array): Promise<void> {
  const sniff = sniffText(data.subarray(0, 4096))
  if (!sniff.ok) throw InvalidError.of(['file'], sniff.reason)
  let head = data
  let complete = true
  if (data.length > UPLOAD_CHECK_BYTES) {
    const cut = data.lastIndexOf(0x0a, UPLOAD_CHECK_BYTES)
    head = data.subarray(0, cut > 0 ? cut + 1 : UPLOAD_CHECK_BYTES)
    complete = false
  }
  try {
    await parseCapture([head], complete ? {} : { minSamples: 1 })
  } catch (err) {
    if (err instanceof CaptureFormatError) throw InvalidError.of(['file'], err.message)
    throw err
  }
}

export async function storeCapture(link: Link, userId: number, file: UploadedFile, fields: CaptureUploadFields) {
  // the route refuses larger bodies with 413 before reading them (server/utils/upload.ts)
  if (file.data.length > CAPTURE_MAX_BYTES) throw InvalidError.of(['file'], `a capture may be at most ${mib(CAPTURE_MAX_BYTES)}`)
  if (file.data.length === 0) throw InvalidError.of(['file'], 'the file is empty')
  await checkCaptureBytes(file.data)
  const options: CaptureOptions = {
    ...(fields.inputChannel !== undefined ? { input: fields.inputChannel - 1 } : {}),
    ...(fields.outputChannel !== undefined ? { output: fields.outputChannel - 1 } : {}),
    ...(fields.inverting !== undefined ? { inverting: fields.inverting } : {}),
    ...(fields.rl !== undefined ? { rl: fields.rl } : {}),
  }
  const key = newObjectKey('captures', link.teamId)
  const sha256 = createHash('sha256').update(file.data).digest('hex')
  const contentType = 'text/csv'
  const storage = useStorage()
  await storage.put(key, file.data, contentType)
  let capture: Capture
  try {
    capture = await useDb().transaction(async (transaction) => {
      const c = await Capture.create(
        { linkId: link.id, teamId: link.teamId, ownerId: userId, label: fields.label ?? '', objectKey: key, fileName: displayName(file.name), size: file.data.length, contentType, sha256, options },
        { transaction },
      )
      await audit(transaction, { teamId: link.teamId, userId, action: 'capture.create', entity: 'capture', entityId: c.id, detail: { linkId: link.id, fileName: c.fileName, size: file.data.length, sha256 } })
      return c
    })
  } catch (err) {
    await storage.remove(key)
    throw err
  }
  // after the commit: a crash here leaves the row "queued", and the start-up sweep
  // (server/plugins/jobs.ts) queues it again
  await enqueueCaptureExtraction(capture.id)
  return Capture.findByPk(capture.id, { include: [withOwner], attributes: { exclude: ['waveform'] }, rejectOnEmpty: true })
}

/** One page of the link's captures, newest first, with summaries only (neither the full result nor the waveform). */
export function listCaptures(linkId: number, page: Page) {
  return Capture.findAndCountAll({ where: { linkId }, include: [withOwner], attributes: { exclude: ['waveform', 'result'] }, order: [['id', 'DESC']], limit: page.limit, offset: page.offset })
}

/** Captures left "queued" (a crash between commit and send): queue them again. */
/** A running extraction writes at least this often (progress or heartbeat); one silent longer was interrupted. */
export const EXTRACTION_SILENCE_MS = 45_000

/**
 * Queue again every capture a crash left behind: those still queued, and those "running"
 * whose worker has been silent for EXTRACTION_SILENCE_MS (its process died); these are
 * marked queued with the reason, which the capture list shows as "retrying".
 */
export async function requeueStrandedCaptures(): Promise<number> {
  const silentSince = new Date(Date.now() - EXTRACTION_SILENCE_MS)
  await Capture.update(
    { status: 'queued', progress: 0, error: 'the extraction was interrupted (the server stopped); retrying' },
    { where: { status: 'running', updatedAt: { [Op.lt]: silentSince } } },
  )
  const stranded = await Capture.findAll({ where: { status: { [Op.in]: ['queued'] } }, attributes: ['id'] })
  for (const c of stranded) await enqueueCaptureExtraction(c.id)
  return stranded.length
}

export async function deleteCapture(capture: Capture, userId: number) {
  await useDb().transaction(async (transaction) => {
    await audit(transaction, { teamId: capture.teamId, userId, action: 'capture.delete', entity: 'capture', entityId: capture.id, detail: { linkId: capture.linkId, fileName: capture.fileName } })
    await capture.destroy({ transaction })
  })
  await useStorage().remove(capture.objectKey)
}

export async function storeDatasheet(part: Part, userId: number, file: UploadedFile) {
  if (file.data.length > DATASHEET_MAX_BYTES) throw InvalidError.of(['file'], `a datasheet may be at most ${mib(DATASHEET_MAX_BYTES)}`)
  if (!isPdf(file.data.subarray(0, 8))) throw InvalidError.of(['file'], 'a datasheet must be a PDF (the file does not start with %PDF-)')
  const teamId = part.teamId as number
  const key = newObjectKey('datasheets', teamId)
  const sha256 = createHash('sha256').update(file.data).digest('hex')
  const storage = useStorage()
  await storage.put(key, file.data, 'application/pdf')
  try {
    const id = await useDb().transaction(async (transaction) => {
      const d = await PartDatasheet.create({ partId: part.id, teamId, ownerId: userId, objectKey: key, fileName: displayName(file.name), size: file.data.length, contentType: 'application/pdf', sha256 }, { transaction })
      await audit(transaction, { teamId, userId, action: 'datasheet.create', entity: 'datasheet', entityId: d.id, detail: { partId: part.id, fileName: d.fileName, size: file.data.length, sha256 } })
      return d.id
    })
    return PartDatasheet.findByPk(id, { include: [withOwner], rejectOnEmpty: true })
  } catch (err) {
    await storage.remove(key)
    throw err
  }
}

/** One page of the part's datasheets, newest first. */
export function listDatasheets(partId: number, page: Page) {
  return PartDatasheet.findAndCountAll({ where: { partId }, include: [withOwner], order: [['id', 'DESC']], limit: page.limit, offset: page.offset })
}
