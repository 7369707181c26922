import { ReportTablesQuery } from '../../../../shared/schemas/report'
import { reportTableCsv } from '../../../reports/csv'
import { NotFoundError } from '../../../utils/errors'

/** One table of the revision as CSV (any member); 404 when the revision has no such table. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { report } = await requireReport(event, reportId, 'report.read')
  const { table } = await validQuery(event, ReportTablesQuery)
  const csv = reportTableCsv(report.result, table, report.pullup?.sweep ?? null, report.thresholds ?? undefined)
  if (csv === null) throw new NotFoundError(`table '${table}' in this revision`)
  sendAs(event, 'text/csv; charset=utf-8', `${fileSlug(report.linkName)}-r${report.number}-${table}.csv`)
  return csv
})
