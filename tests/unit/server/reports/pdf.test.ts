import { execFileSync } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'
import { ADC_SPI_LINK, TELEMETRY_LINK } from '../../../../server/db/seeders/demo-links'
import { analyseCaptureStream } from '../../../../server/captures/analyse'
import { freezeCaptures } from '../../../../server/reports/captures'
import { buildReportPdf, pdfText, REPORT_FONT_FILES, type ReportFonts } from '../../../../server/reports/pdf'
import { applyCaptureToStage } from '../../../../shared/utils/capture-apply'
import { formatEng, formatUi } from '../../../../shared/utils/units'
import { couplerCapture } from '../../../factories/captures'
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
      const pkg = f.startsWith('inter') ? '@fontsource/inter' : f.startsWith('noto-sans-math') ? '@fontsource/noto-sans-math' : '@fontsource/jetbrains-mono'
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
    expect(text).toMatch(/RL 4\.7 kΩ/)
    expect(text).toContain('Safety caution')
    expect(text.replace(/\s+/g, ' ')).toContain('bench verification of every link is still required')
    expect(text).toContain('Rowan Reviewer')
    expect(text).toContain('2026-12-03 09:30 UTC')
    expect(text).toContain('Bit d0 of telemetry: d0 late side checked on the bench')
    expect(text).toContain(`engine ${report.engineVersion}`)
    // units print as written (issue 17): µ, Ω and ± come from the shipped subsets, nothing is replaced
    expect(text).toMatch(/\d µs/)
    expect(text).toContain('±')
    expect(text).not.toMatch(/\uFFFD|\d us\b|kohm|\+-/)
    // page 1 carries the sign-off: state, reviewer, decision date, revision and engine
    const page1 = execFileSync('pdftotext', ['-f', '1', '-l', '1', '-layout', path.join(dir, 'uart.pdf'), '-'], { encoding: 'utf8' })
    expect(page1).toMatch(/State\s+signed off/)
    expect(page1).toContain('Rowan Reviewer')
    expect(page1).toMatch(/Signed off\s+2026-12-03 09:30 UTC by Rowan Reviewer/)
    expect(page1).toMatch(/Revision\s+r1 of link version 1/)
    expect(page1).toMatch(new RegExp(`Engine\\s+${report.engineVersion.replace(/\./g, '\\.')}`))
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

  it('lists the captures that back the revision with their measured delays and transition times', async () => {
    const plain = buildReportDetail(TELEMETRY_LINK)
    const none = pdfToText(await buildReportPdf(plain, fonts), 'no-captures')
    expect(none).toContain('Captures that back this revision')
    expect(none).toContain('No oscilloscope capture backs this revision')

    const { result } = await analyseCaptureStream([couplerCapture().text])
    const measured = JSON.parse(JSON.stringify(result))
    const applied = applyCaptureToStage(plain.input, { channel: 0, stage: 0 }, measured, 'characterization', { rl: 4700 }).spec
    const source = { id: 41, label: 'coupler at 4.7k', fileName: 'bench-0412.csv', sha256: 'c0ffee'.padEnd(64, '0'), size: 2_345_678, options: { rl: 4700 }, result: measured, createdAt: new Date('2026-12-01T15:20:00.000Z'), owner: { id: 1, name: 'Demo Engineer' } }
    const captures = freezeCaptures([source], applied).map((c) => ({ ...c, available: false }))
    const report = buildReportDetail(TELEMETRY_LINK, { input: applied, captures })
    const text = pdfToText(await buildReportPdf(report, fonts), 'captures')
    const flat = text.replace(/\s+/g, ' ')
    const c = captures[0]!
    expect(text).toContain('Captures that back this revision')
    expect(text).not.toContain('No oscilloscope capture backs this revision')
    expect(text).toContain('Capture 41: coupler at 4.7k')
    expect(flat).toContain('bench-0412.csv (2,345,678 bytes), since deleted')
    expect(text).toContain(c.sha256)
    expect(flat).toContain('2026-12-01 15:20 UTC by Demo Engineer')
    expect(flat).toContain('in 1 "TX pin (V)" → out 2 "Coupler out (V)", inverting')
    expect(flat).toMatch(/Applied to .* \(channel telemetry, stage 1\) as a characterisation point/)
    const eng = (v: number, digits = 4) => pdfText(formatEng(v, 's', { digits }))
    for (const [name, st] of [['tPLH', c.tPLH!], ['tPHL', c.tPHL!], ['tr (output)', c.output!.tr!], ['tf (output)', c.output!.tf!]] as const) {
      const row = text.split('\n').find((l) => l.trimStart().startsWith(name))
      expect(row, name).toBeDefined()
      expect(row!.replace(/\s+/g, ' ')).toContain(`${st.count} ${eng(st.min)} ${eng(st.mean)} ${eng(st.max)} ${eng(st.sigma, 3)}`)
    }
    // the measured means are the synthetic path's delays
    expect(eng(c.tPLH!.mean, 2)).toBe('22 µs')
    expect(eng(c.tPHL!.mean, 2)).toBe('3 µs')
    expect(text).not.toMatch(/\uFFFD/)
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
