/**
 * The PDF fonts as the built server holds them: Nitro serverAssets (server/assets/fonts,
 * bundled at build time), read once per process.
 */
import { REPORT_FONT_FILES, type ReportFonts } from './pdf'

let fonts: Promise<ReportFonts> | undefined

async function readAll(): Promise<ReportFonts> {
  const storage = useStorage('assets:server')
  const out: Partial<ReportFonts> = {}
  for (const [key, file] of Object.entries(REPORT_FONT_FILES) as [keyof ReportFonts, string][]) {
    const raw = await storage.getItemRaw<Uint8Array | Buffer>(`fonts:${file}`)
    if (!raw) throw new Error(`the PDF font ${file} is missing from the server assets`)
    out[key] = Buffer.from(raw)
  }
  return out as ReportFonts
}

export function reportFonts(): Promise<ReportFonts> {
  fonts ??= readAll().catch((err) => {
    fonts = undefined
    throw err
  })
  return fonts
}
