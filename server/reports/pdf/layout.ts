/**
 * The PDF's page layout over pdfkit: fonts with fallback per character, text, headings,
 * key-value lists, tables drawn from the shared column specs, bullets, and page footers.
 * Every section renderer (sections.ts) and chart (charts.ts) draws through one Layout.
 *
 * Fonts: Inter for text, JetBrains Mono for numbers, each as its fontsource latin subset
 * plus its greek subset (Ω, τ, σ), and Noto Sans Math for the signs no subset holds
 * (≤, ≥, →, √, ≈). A string is drawn as runs, each in the first font that has its glyphs,
 * so "4.7 kΩ", "±2 %" and "25 µs" print as written.
 */
import * as fontkit from 'fontkit'
import type PDFDocument from 'pdfkit'
import { cellText, columnsFor, type ReportColumn } from '../../../shared/report/tables'
import type { MarginState } from '../../../shared/report/vocabulary'

export interface ReportFonts {
  /** Inter 400, latin subset, .woff */
  text: Buffer
  /** Inter 600 */
  textBold: Buffer
  /** JetBrains Mono 400 */
  mono: Buffer
  /** JetBrains Mono 700 */
  monoBold: Buffer
  /** the greek subsets of the four */
  textGreek: Buffer
  textBoldGreek: Buffer
  monoGreek: Buffer
  monoBoldGreek: Buffer
  /** Noto Sans Math 400: the signs no text subset holds */
  symbols: Buffer
}

/** File names of the fonts inside server/assets/fonts (copied unchanged from their @fontsource packages). */
export const REPORT_FONT_FILES: Record<keyof ReportFonts, string> = {
  text: 'inter-latin-400-normal.woff',
  textBold: 'inter-latin-600-normal.woff',
  mono: 'jetbrains-mono-latin-400-normal.woff',
  monoBold: 'jetbrains-mono-latin-700-normal.woff',
  textGreek: 'inter-greek-400-normal.woff',
  textBoldGreek: 'inter-greek-600-normal.woff',
  monoGreek: 'jetbrains-mono-greek-400-normal.woff',
  monoBoldGreek: 'jetbrains-mono-greek-700-normal.woff',
  symbols: 'noto-sans-math-latin-400-normal.woff',
}

export type Doc = InstanceType<typeof PDFDocument>
export type Face = 'text' | 'textBold' | 'mono' | 'monoBold'

// colours: teal healthy, amber thin, rose broken (always with a word beside them)
export const INK = '#1f2933'
export const MUTED = '#52606d'
export const RULE = '#cbd2d9'
export const SOFT = '#f1f5f9'
export const STATE_COLOUR: Record<MarginState, string> = { healthy: '#0f766e', thin: '#b45309', broken: '#be123c', unknown: INK }

// fontkit takes a feature map; the typings only know the array form
const MONO_FEATURES = { liga: false, calt: false } as unknown as PDFKit.Mixins.OpenTypeFeatures[]

/** Signs no shipped font holds, spelled in plain letters (a last resort; the fonts cover µ Ω ± ≤ ≥ → τ σ). */
const SPELLED: Record<string, string> = { '\u2126': 'Ω', '\u2009': ' ', '\u202F': ' ' }

/** Characters a font has no glyph for, spelled out; everything the fonts hold is kept. */
export function pdfText(s: string): string {
  return s.replace(/[\u2126\u2009\u202F]/g, (c) => SPELLED[c] ?? c)
}

interface Coverage {
  has(cp: number): boolean
}
const coverageCache = new WeakMap<Buffer, Coverage>()
function coverage(buf: Buffer): Coverage {
  let c = coverageCache.get(buf)
  if (!c) {
    const font = fontkit.create(buf) as fontkit.Font
    const seen = new Map<number, boolean>()
    c = {
      has(cp) {
        let v = seen.get(cp)
        if (v === undefined) seen.set(cp, (v = font.hasGlyphForCodePoint(cp)))
        return v
      },
    }
    coverageCache.set(buf, c)
  }
  return c
}

export interface TextOpts extends PDFKit.Mixins.TextOptions {
  size?: number
  colour?: string
}

export interface TableOpts<R> {
  caption?: string
  /** extra colour of a row's cells (a stage's channel, a chosen row) */
  rowColour?: (row: R) => string | undefined
}

export class Layout {
  readonly left: number
  readonly width: number
  private readonly fallback: Record<Face, [string, Coverage][]>

  constructor(
    readonly doc: Doc,
    fonts: ReportFonts,
  ) {
    for (const [name, buf] of Object.entries(fonts)) doc.registerFont(name, buf)
    const chain = (primary: keyof ReportFonts, greek: keyof ReportFonts): [string, Coverage][] => [
      [primary, coverage(fonts[primary])],
      [greek, coverage(fonts[greek])],
      ['symbols', coverage(fonts.symbols)],
    ]
    this.fallback = {
      text: chain('text', 'textGreek'),
      textBold: chain('textBold', 'textBoldGreek'),
      mono: chain('mono', 'monoGreek'),
      monoBold: chain('monoBold', 'monoBoldGreek'),
    }
    this.left = doc.page.margins.left
    this.width = doc.page.width - doc.page.margins.left - doc.page.margins.right
  }

  bottom() {
    return this.doc.page.height - this.doc.page.margins.bottom
  }
  /** A new page unless `h` points still fit. */
  ensure(h: number) {
    if (this.doc.y + h > this.bottom()) this.doc.addPage()
  }

  /** `s` split into runs, each in the first font of the face's chain that has its glyphs. */
  runs(s: string, face: Face): { font: string; text: string }[] {
    const chain = this.fallback[face]
    const out: { font: string; text: string }[] = []
    for (const ch of pdfText(s)) {
      const cp = ch.codePointAt(0)!
      const last = out[out.length - 1]
      // a space stays in the run it follows; ASCII is always in the primary font
      const font = last && /\s/.test(ch) ? last.font : cp < 0x80 ? chain[0]![0] : (chain.find(([, c]) => c.has(cp))?.[0] ?? chain[0]![0])
      if (last && last.font === font) last.text += ch
      else out.push({ font, text: ch })
    }
    return out.length ? out : [{ font: chain[0]![0], text: '' }]
  }

  /** Draw `s` in `face` (at x, y when given, else where the text flow is), font by font. */
  write(s: string, face: Face, opts: TextOpts = {}, x?: number, y?: number) {
    const { size = 9, colour = INK, ...rest } = opts
    const mono = face === 'mono' || face === 'monoBold'
    const runs = this.runs(s, face)
    this.doc.fontSize(size).fillColor(colour)
    const featuresOf = (font: string) => (mono && font.startsWith('mono') ? { features: MONO_FEATURES } : {})
    // several fonts on one aligned line: measured and placed run by run (pdfkit aligns each continued run on its own)
    if (runs.length > 1 && x !== undefined && y !== undefined && rest.width && (rest.align === 'right' || rest.align === 'center')) {
      const widths = runs.map((r) => this.doc.font(r.font).fontSize(size).widthOfString(r.text, featuresOf(r.font)))
      const total = widths.reduce((a, b) => a + b, 0)
      if (total <= rest.width) {
        let cx = x + (rest.align === 'right' ? rest.width - total : (rest.width - total) / 2)
        runs.forEach((r, i) => {
          this.doc.font(r.font).text(r.text, cx, y, { ...featuresOf(r.font), lineBreak: false })
          cx += widths[i]!
        })
        this.doc.x = x
        this.doc.y = y + this.doc.currentLineHeight(true)
        return
      }
    }
    runs.forEach((r, i) => {
      const o = { ...rest, ...featuresOf(r.font), continued: i < runs.length - 1 || !!rest.continued }
      this.doc.font(r.font)
      if (i === 0 && x !== undefined) this.doc.text(r.text, x, y, o)
      else this.doc.text(r.text, o)
    })
  }

  /** The height `s` takes at `width` in `face` (measured in the face's primary font). */
  heightOf(s: string, face: Face, size: number, width: number) {
    this.doc.font(face).fontSize(size)
    return this.doc.heightOfString(pdfText(s), { width, ...(face.startsWith('mono') ? { features: MONO_FEATURES } : {}) })
  }

  text(s: string, opts: TextOpts & { bold?: boolean } = {}) {
    const { bold = false, ...rest } = opts
    this.write(s, bold ? 'textBold' : 'text', rest)
  }
  /** A number at a fixed place, on one line. */
  mono(s: string, x: number, y: number, opts: TextOpts & { bold?: boolean } = {}) {
    const { bold = false, size = 8, ...rest } = opts
    this.write(s, bold ? 'monoBold' : 'mono', { size, ...rest, lineBreak: false }, x, y)
  }
  /** A section heading with a rule, on a new page when asked or when little room is left. */
  heading(s: string, newPage = false) {
    if (newPage) this.doc.addPage()
    else {
      this.ensure(60)
      this.doc.moveDown(0.8)
    }
    this.doc.x = this.left
    this.text(s, { size: 12.5, bold: true })
    const y = this.doc.y + 2
    this.doc.moveTo(this.left, y).lineTo(this.left + this.width, y).lineWidth(0.5).strokeColor(RULE).stroke()
    this.doc.y = y + 6
  }
  subheading(s: string) {
    this.text(s, { size: 9.5, bold: true })
    this.doc.moveDown(0.2)
  }
  note(s: string) {
    this.text(s, { size: 8, colour: MUTED })
  }
  /** Key / value rows; the value in the number font, wrapped within its column. */
  keyValues(rows: [string, string][], keyWidth = 130, x = this.left, width = this.width) {
    for (const [k, v] of rows) {
      this.ensure(14)
      const y = this.doc.y
      this.write(k, 'text', { size: 8.5, colour: MUTED, width: keyWidth - 4 }, x, y)
      const hk = this.doc.y - y
      this.write(v, 'mono', { size: 8.5, width: width - keyWidth }, x + keyWidth, y)
      this.doc.y = Math.max(this.doc.y, y + hk) + 2
    }
    this.doc.x = this.left
  }
  bullets(items: string[], colour = INK) {
    for (const item of items) {
      this.ensure(14)
      const y = this.doc.y
      this.write('–', 'text', { size: 8, colour: MUTED, width: 8 }, this.left, y)
      this.write(item, 'text', { size: 8, colour, width: this.width - 10 }, this.left + 10, y)
      this.doc.moveDown(0.15)
    }
    this.doc.x = this.left
  }
  /** A framed paragraph with a bold lead ("Safety caution."). */
  box(lead: string, body: string, stroke: string, fill: string) {
    this.ensure(50)
    const y = this.doc.y
    const h = this.heightOf(`${lead} ${body}`, 'text', 8, this.width - 16) + 12
    this.doc.rect(this.left, y, this.width, h).lineWidth(0.8).fillAndStroke(fill, stroke)
    this.write(`${lead} `, 'textBold', { size: 8, width: this.width - 16, continued: true }, this.left + 8, y + 6)
    this.write(body, 'text', { size: 8, width: this.width - 16 })
    this.doc.y = y + h + 4
    this.doc.x = this.left
  }

  /**
   * A shared report table (shared/report/tables.ts): the PDF's columns, widths scaled to the
   * page, headers wrapped (never cut), a cell coloured by its state, the header repeated on
   * each page.
   */
  table<R>(columns: ReportColumn<R>[], rows: R[], opts: TableOpts<R> = {}) {
    const doc = this.doc
    const specs = columnsFor(columns, 'pdf')
    const total = specs.reduce((s, c) => s + (c.width ?? 60), 0)
    const cols = specs.map((c) => ({ c, w: ((c.width ?? 60) * this.width) / total, face: (c.numeric ? 'mono' : 'text') as Face }))
    const size = 7.5
    const headerH = Math.max(...cols.map(({ c, w }) => this.heightOf(c.label, 'textBold', size, w - 6))) + 6
    const drawHeader = () => {
      const y = doc.y
      doc.rect(this.left, y, this.width, headerH).fill(SOFT)
      let x = this.left
      for (const { c, w } of cols) {
        this.write(c.label, 'textBold', { size, colour: MUTED, width: w - 6, align: c.numeric ? 'right' : 'left' }, x + 3, y + 3)
        x += w
      }
      doc.y = y + headerH
    }
    if (opts.caption) {
      this.ensure(headerH + 40)
      this.note(opts.caption)
      doc.moveDown(0.2)
    }
    this.ensure(headerH + 26)
    drawHeader()
    for (const row of rows) {
      const cells = cols.map(({ c }) => cellText(c, row))
      const h = Math.max(13, ...cells.map((cell, i) => this.heightOf(cell, cols[i]!.face, size, cols[i]!.w - 6) + 5))
      if (doc.y + h > this.bottom()) {
        doc.addPage()
        drawHeader()
      }
      const y = doc.y
      let x = this.left
      cols.forEach(({ c, w, face }, i) => {
        const colour = c.state ? STATE_COLOUR[c.state(row)] : (opts.rowColour?.(row) ?? INK)
        this.write(cells[i]!, face, { size, colour, width: w - 6, align: c.numeric ? 'right' : 'left' }, x + 3, y + 3)
        x += w
      })
      doc.moveTo(this.left, y + h).lineTo(this.left + this.width, y + h).lineWidth(0.3).strokeColor(RULE).stroke()
      doc.y = y + h
    }
    doc.x = this.left
    doc.moveDown(0.4)
  }

  /** "page n of m" and the revision's line at the foot of every page. */
  footers(line: string) {
    const doc = this.doc
    const range = doc.bufferedPageRange()
    for (let i = range.start; i < range.start + range.count; i++) {
      doc.switchToPage(i)
      const saved = doc.page.margins.bottom
      doc.page.margins.bottom = 0
      this.write(line, 'text', { size: 7, colour: MUTED, width: this.width - 60, lineBreak: false }, this.left, doc.page.height - 36)
      this.write(`page ${i + 1} of ${range.count}`, 'text', { size: 7, colour: MUTED, width: 60, align: 'right', lineBreak: false }, this.left + this.width - 60, doc.page.height - 36)
      doc.page.margins.bottom = saved
    }
  }
}
