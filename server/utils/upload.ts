/**
 * Reading one uploaded file from a multipart form, with the size limit enforced before
 * the body is read (413 from Content-Length) and again on the bytes received.
 */
import type { H3Event } from 'h3'
import { InvalidError } from './errors'

export interface Upload {
  file: { name: string; data: Uint8Array }
  /** the form's text fields */
  fields: Record<string, string>
}

const tooLarge = (maxBytes: number, what: string) =>
  createError({ statusCode: 413, statusMessage: `${what} may be at most ${Math.round(maxBytes / 1024 / 1024)} MB` })

/** The multipart form's `file` part and text fields; 413 over `maxBytes`, 400 without a file. */
export async function readUpload(event: H3Event, maxBytes: number, what: string): Promise<Upload> {
  const type = getHeader(event, 'content-type') ?? ''
  if (!type.toLowerCase().startsWith('multipart/form-data')) throw InvalidError.of(['file'], 'send the file as multipart/form-data')
  const declared = Number(getHeader(event, 'content-length') ?? NaN)
  // the form's own framing adds a few hundred bytes to the file
  if (Number.isFinite(declared) && declared > maxBytes + 64 * 1024) throw tooLarge(maxBytes, what)
  const parts = (await readMultipartFormData(event)) ?? []
  const filePart = parts.find((p) => p.name === 'file' && p.filename !== undefined)
  if (!filePart) throw InvalidError.of(['file'], 'no file was sent (form field "file")')
  if (filePart.data.length > maxBytes) throw tooLarge(maxBytes, what)
  const fields: Record<string, string> = {}
  for (const p of parts) if (p.name && p.name !== 'file' && p.filename === undefined) fields[p.name] = p.data.toString('utf8')
  return { file: { name: filePart.filename || 'upload', data: new Uint8Array(filePart.data.buffer, filePart.data.byteOffset, filePart.data.length) }, fields }
}
