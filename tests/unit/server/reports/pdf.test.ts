import { execFileSync } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'
import { ADC_SPI_LINK, TELEMETRY_LINK } from '../../../../server/db/seeders/demo-links'
import { buildReportPdf, REPORT_FONT_FILES, type ReportFonts } from '../../../../server/reports/pdf'
import { formatUi } from '../../../../shared/utils/units'
import { buildReportDetail } from '../../../factories/reports'

const fonts = Object.fromEntries(
  Object.entries(REPORT_FONT_FILES).map(([k, f]) => [k, readFileSync(path.resolve('server/assets/fonts', f))]),
) as unknown as ReportFonts
const dir = mkdtempSync(path.join(tmpdir(), 'bitslack-pdf-'))
afterAll(() => rmSync(dir, { recursive: true, force: true }))

function pdfToText(pdf: Buffer, name: string) {
  const file = path.join(dir, `${name}.pdf`)
  writeFileSync(file, pdf)
  return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
}

describe('margin report PDF', () => {
  it('ships the fontsource files unchanged', () => {
    for (const f of Object.values(REPORT_FONT_FILES)) {
      const pkg = f.startsWith('inter') ? '@fontsource/inter' : '@fontsource/jetbrains-mono'
      expect(readFileSync(path.resolve('server/assets/fonts', f)).equals(readFileSync(path.resolve('node_modules', pkg, 'files', f)))).toBe(true)
    }
  })

  it('opens and carries the UART report: verdict, worst margin, every bit, caution, sign-off', async () => {
    const report = buildReportDetail(TELEMETRY_LINK, {
      state: 'signed-off',
      reviewer: { id: 2, name: 'Rowan Reviewer' },
      decidedBy: { id: 2, name: 'Rowan Reviewer' },
      decidedAt: '2026-12-03T09:30:00.000Z',
      submittedAt: '2026-12-02T11:00:00.000Z',
      comments: [{ id: 1, target: { kind: 'bit', channelId: 'telemetry', index: 1 }, body: 'd0 late side checked on the bench', author: { id: 2, name: 'Rowan Reviewer' }, createdAt: '2026-12-03T09:00:00.000Z' }],
    })
    const pdf = await buildReportPdf(report, fonts)
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-')
    writeFileSync(path.join(dir, 'x.pdf'), pdf)
    const info = execFileSync('pdfinfo', [path.join(dir, 'x.pdf')], { encoding: 'utf8' })
    expect(info).toMatch(/Page size:\s+595\.\d+ x 841\.\d+ pts \(A4\)/)
    const pages = Number(/Pages:\s+(\d+)/.exec(info)![1])
    expect(pages).toBeGreaterThanOrEqual(3)
    const fontList = execFileSync('pdffonts', [path.join(dir, 'x.pdf')], { encoding: 'utf8' })
    expect(fontList).toMatch(/Inter/)
    expect(fontList).toMatch(/JetBrainsMono/)

    const text = pdfToText(pdf, 'uart')
    const uart = report.result.uart!
    expect(text).toContain('Gate-driver telemetry UART')
    expect(text).toContain('revision r1 · signed off')
    expect(text).toContain('FAIL')
    expect(text).toContain(formatUi(uart.worstMarginUi))
    for (const b of uart.bits) expect(text).toContain(formatUi(b.marginUi))
    expect(text).toContain('Bit timeline')
    expect(text).toContain('Rate sweep')
    expect(text).toContain('Pull-up choice')
    expect(text).toMatch(/RL 4\.7 kohm/)
    expect(text).toContain('Safety caution')
    expect(text.replace(/\s+/g, ' ')).toContain('bench verification of every link is still required')
    expect(text).toContain('Rowan Reviewer')
    expect(text).toContain('2026-12-03 09:30 UTC')
    expect(text).toContain('Bit d0 of telemetry: d0 late side checked on the bench')
    expect(text).toContain(`engine ${report.engineVersion}`)
    // no glyph fell outside the fonts' subsets
    expect(text).not.toMatch(/[µΩ\uFFFD]/)
  })

  it('draws the SPI checks and honours Letter paper', async () => {
    const report = buildReportDetail(ADC_SPI_LINK)
    const pdf = await buildReportPdf(report, fonts, 'LETTER')
    writeFileSync(path.join(dir, 'spi.pdf'), pdf)
    expect(execFileSync('pdfinfo', [path.join(dir, 'spi.pdf')], { encoding: 'utf8' })).toMatch(/612 x 792 pts \(letter\)/)
    const text = pdfToText(pdf, 'spi')
    for (const c of report.result.spi!.checks) expect(text).toContain(c.id)
    expect(text).toContain('SCLK candidates')
    expect(text).not.toContain('Pull-up choice')
  })

  it('renders the timeline page to an image with ink on it', async () => {
    const pdf = await buildReportPdf(buildReportDetail(TELEMETRY_LINK), fonts)
    const file = path.join(dir, 'render.pdf')
    writeFileSync(file, pdf)
    const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [file], { encoding: 'utf8' }))![1])
    let page = 0
    for (let i = 1; i <= pages && !page; i++)
      if (execFileSync('pdftotext', ['-f', String(i), '-l', String(i), file, '-'], { encoding: 'utf8' }).includes('Bit timeline')) page = i
    expect(page).toBeGreaterThan(0)
    execFileSync('pdftoppm', ['-f', String(page), '-l', String(page), '-r', '40', '-gray', file, path.join(dir, 'page')])
    const pgm = [`page-${page}.pgm`, `page-0${page}.pgm`].map((f) => path.join(dir, f)).find((f) => existsSync(f))!
    const bytes = readFileSync(pgm)
    // the timeline page is not blank: a good share of pixels is not white
    const pixels = bytes.subarray(bytes.length - Math.floor(bytes.length * 0.9))
    const dark = pixels.filter((p) => p < 200).length
    expect(dark / pixels.length).toBeGreaterThan(0.01)
  })
})
