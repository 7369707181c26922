/**
 * The margin report as a PDF (issue 6), drawn with pdfkit: text in Inter, numbers in
 * JetBrains Mono, signs in Noto Sans Math (all shipped with the app, server/assets/fonts),
 * the bit timeline, the rate sweep and every table as vector graphics. Pure: it takes the
 * revision DTO (whose `result` is the engine's frozen analysis) and the font files, and
 * returns the bytes, so the route and the tests build the very same document.
 *
 * One renderer per section (pdf/sections.ts) over a shared layout (pdf/layout.ts); the
 * words and the table columns are the shared report vocabulary's (shared/report).
 */
import PDFDocument from 'pdfkit'
import { REPORT_STATE_LABEL } from '../../shared/schemas/report'
import type { ReportDetailDto, RevisionComparisonDto } from '../../shared/types/report'
import { Layout, pdfText, REPORT_FONT_FILES, type Doc, type ReportFonts } from './pdf/layout'
import {
  bitsSection,
  capturesSection,
  changesSection,
  commentTargetText,
  notesSection,
  pullupSection,
  ratesSection,
  reviewSection,
  settingsSection,
  spiSection,
  busSection,
  stagesSection,
  summarySection,
  titleSection,
} from './pdf/sections'

export { pdfText, REPORT_FONT_FILES, commentTargetText, type ReportFonts }
export type PaperSize = 'A4' | 'LETTER'

/** The sections in the order the report reads. */
const SECTIONS = [titleSection, summarySection, stagesSection, settingsSection, bitsSection, spiSection, busSection, ratesSection, pullupSection, capturesSection, notesSection, reviewSection]

/** Build the PDF of one revision (after r1, with what changed since the revision before it). */
export async function buildReportPdf(report: ReportDetailDto, fonts: ReportFonts, paper: PaperSize = 'A4', changes: RevisionComparisonDto | null = null): Promise<Buffer> {
  const doc: Doc = new PDFDocument({
    size: paper,
    margins: { top: 56, bottom: 56, left: 50, right: 50 },
    bufferPages: true,
    info: {
      Title: `Margin report ${report.label}: ${report.linkName}`,
      Author: report.author?.name ?? 'Bitslack',
      Subject: 'Timing budget of an isolated serial link',
      Creator: 'Bitslack',
      Producer: 'Bitslack',
      CreationDate: new Date(report.createdAt),
    },
  })
  const chunks: Buffer[] = []
  doc.on('data', (c: Buffer) => chunks.push(c))
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })
  const layout = new Layout(doc, fonts)
  for (const section of SECTIONS) {
    section(layout, report)
    if (section === summarySection) changesSection(layout, report, changes)
  }
  layout.footers(`${report.linkName} · ${report.label} · ${REPORT_STATE_LABEL[report.state]} · engine ${report.engineVersion}`)
  doc.end()
  return done
}
