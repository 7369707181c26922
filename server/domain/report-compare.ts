/**
 * Comparing two revisions of one link (a reviewer asked to sign off r3 reads what changed since
 * r2): computed from the frozen inputs and frozen results, so it says what the revisions said.
 */
import { Op } from 'sequelize'
import { diffLinks, groupInputs } from '../../shared/report/compare'
import { revisionLabel } from '../../shared/schemas/report'
import type { RevisionComparisonDto } from '../../shared/types/report'
import { ReportRevision } from '../db/models'

/** The revision of the same link just before this one, or null for its first. */
export function previousRevision(r: ReportRevision) {
  if (r.linkId === null) return Promise.resolve(null)
  return ReportRevision.findOne({ where: { linkId: r.linkId, number: { [Op.lt]: r.number } }, order: [['number', 'DESC']] })
}

/** What changed from the earlier revision to the later one (in either order of the arguments). */
export function compareRevisions(x: ReportRevision, y: ReportRevision): RevisionComparisonDto {
  const [a, b] = x.number <= y.number ? [x, y] : [y, x]
  const d = diffLinks(a.input, b.input, a.result, b.result)
  const side = (r: ReportRevision) => ({ id: r.id, label: revisionLabel(r.number), verdict: r.verdict, linkVersion: r.linkVersion, state: r.state })
  return { from: side(a), to: side(b), verdict: d.verdict, inputs: groupInputs(d.inputs, a.input, b.input), margins: d.margins }
}
