import type { H3Event } from 'h3'

/** A file name made of safe characters: "Gate-driver telemetry UART" -> "gate-driver-telemetry-uart". */
export function fileSlug(s: string): string {
  return s.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 80) || 'link'
}

/** Headers of a file download (attachment, or inline for a PDF the browser shows). */
export function sendAs(event: H3Event, type: string, filename: string, inline = false) {
  setResponseHeader(event, 'content-type', type)
  setResponseHeader(event, 'content-disposition', `${inline ? 'inline' : 'attachment'}; filename="${filename}"`)
  setResponseHeader(event, 'cache-control', 'private, no-store')
}
