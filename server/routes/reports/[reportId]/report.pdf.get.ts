import { ReportPdfQuery } from '../../../../shared/schemas/report'
import { latestNumber, loadRevision } from '../../../domain/reports'
import { compareRevisions, previousRevision } from '../../../domain/report-compare'
import { presentReport } from '../../../presenters/report'
import { reportFonts } from '../../../reports/fonts'
import { buildReportPdf } from '../../../reports/pdf'

/** The revision as a PDF (any member): the same document for everyone, A4 or Letter; after r1 with the changes since the revision before. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { role, user, report } = await requireReport(event, reportId, 'report.read')
  const { paper, download } = await validQuery(event, ReportPdfQuery)
  const dto = presentReport(await loadRevision(report.id), role, user.id, await latestNumber(report.linkId))
  const before = await previousRevision(report)
  const pdf = await buildReportPdf(dto, await reportFonts(), paper === 'letter' ? 'LETTER' : 'A4', before ? compareRevisions(before, report) : null)
  sendAs(event, 'application/pdf', `${fileSlug(dto.linkName)}-${dto.label}.pdf`, download === '0')
  return pdf
})
