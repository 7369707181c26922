/**
 * Content sniffing by bytes: what a file is, judged from its first bytes and never from
 * its name or the client's content type.
 */

/** A binary format recognised by its magic bytes. */
export interface MagicType {
  /** short name shown to the user, e.g. "PDF document" */
  name: string
  /** the leading bytes; null matches any byte at that position */
  magic: readonly (number | null)[]
}

const ascii = (s: string) => [...s].map((c) => c.charCodeAt(0))

// common practice: the leading signatures of the binary formats people upload by mistake
const MAGIC: readonly MagicType[] = [
  { name: 'PDF document', magic: ascii('%PDF-') },
  { name: 'ZIP archive (or an Office document)', magic: [0x50, 0x4b, 0x03, 0x04] },
  { name: 'ZIP archive (empty)', magic: [0x50, 0x4b, 0x05, 0x06] },
  { name: 'gzip archive', magic: [0x1f, 0x8b] },
  { name: '7-Zip archive', magic: [0x37, 0x7a, 0xbc, 0xaf, 0x27, 0x1c] },
  { name: 'RAR archive', magic: ascii('Rar!') },
  { name: 'xz archive', magic: [0xfd, 0x37, 0x7a, 0x58, 0x5a, 0x00] },
  { name: 'bzip2 archive', magic: ascii('BZh') },
  { name: 'PNG image', magic: [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a] },
  { name: 'JPEG image', magic: [0xff, 0xd8, 0xff] },
  { name: 'GIF image', magic: ascii('GIF8') },
  { name: 'TIFF image', magic: [0x49, 0x49, 0x2a, 0x00] },
  { name: 'TIFF image', magic: [0x4d, 0x4d, 0x00, 0x2a] },
  { name: 'WebP image', magic: [...ascii('RIFF'), null, null, null, null, ...ascii('WEBP')] },
  { name: 'RIFF file (WAV/AVI)', magic: ascii('RIFF') },
  { name: 'BMP image', magic: [0x42, 0x4d, null, null, null, null, 0x00, 0x00, 0x00, 0x00] },
  { name: 'OLE2 document (legacy Office)', magic: [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1] },
  { name: 'HDF5 file', magic: [0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a] },
  { name: 'ELF executable', magic: [0x7f, 0x45, 0x4c, 0x46] },
  { name: 'Windows executable', magic: ascii('MZ') },
  { name: 'UTF-16 text (export the capture as ASCII or UTF-8)', magic: [0xff, 0xfe] },
  { name: 'UTF-16 text (export the capture as ASCII or UTF-8)', magic: [0xfe, 0xff] },
]

/** The binary format whose magic bytes start `head`, or null. */
export function binaryTypeOf(head: Uint8Array): string | null {
  for (const m of MAGIC) {
    if (head.length < m.magic.length) continue
    if (m.magic.every((b, i) => b === null || head[i] === b)) return m.name
  }
  return null
}

/** True when `head` starts with the PDF signature `%PDF-` (ISO 32000, file header). */
export function isPdf(head: Uint8Array): boolean {
  return binaryTypeOf(head) === 'PDF document'
}

export type TextSniff = { ok: true } | { ok: false; reason: string }

/**
 * Whether `head` (the first bytes of a file, a few kilobytes are plenty) can be a text
 * capture: no known binary signature, no NUL byte, no control characters other than
 * tab, CR, LF and form feed. Bytes >= 0x80 are allowed (UTF-8 units such as "µs").
 */
export function sniffText(head: Uint8Array): TextSniff {
  if (head.length === 0) return { ok: false, reason: 'the file is empty' }
  const kind = binaryTypeOf(head)
  if (kind) return { ok: false, reason: `this is a ${kind}, not a CSV or TSV capture` }
  for (let i = 0; i < head.length; i++) {
    const b = head[i]!
    if (b === 0) return { ok: false, reason: 'binary content (NUL byte), not a CSV or TSV capture' }
    if (b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0x0c) {
      return { ok: false, reason: `binary content (control byte 0x${b.toString(16).padStart(2, '0')}), not a CSV or TSV capture` }
    }
  }
  return { ok: true }
}
