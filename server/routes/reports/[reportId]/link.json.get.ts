/** The revision's frozen link as link JSON (shared schema, with schemaVersion), ready to import. */
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { reportId } = await validParams(event, idParams('reportId'))
  const { report } = await requireReport(event, reportId, 'report.read')
  sendAs(event, 'application/json; charset=utf-8', `${fileSlug(report.linkName)}-r${report.number}.json`)
  return JSON.stringify(report.input, null, 2) + '\n'
})
