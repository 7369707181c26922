import { diffLinks, groupInputs } from '../../../../shared/report/compare'
import { revisionLabel } from '../../../../shared/schemas/report'
import type { RevisionComparisonDto } from '../../../../shared/types/report'
import { requireCompleteSpec } from '../../../domain/analysis'
import { signOffOf } from '../../../domain/sign-offs'
import { ReportRevision } from '../../../db/models'
import { analyzeParsedLink } from '../../../timing'
import { ConflictError } from '../../../utils/errors'

/**
 * What changed in the saved link since its latest signed-off revision (any member): the
 * revision's frozen inputs and result against the link as saved now, analysed by the current
 * engine. 409 when no revision of the link is signed off, or the link still has values to enter.
 */
export default defineApiHandler(async (event): Promise<RevisionComparisonDto> => {
  await requireUser(event)
  const { linkId } = await validParams(event, idParams('linkId'))
  const { link } = await requireLink(event, linkId, 'link.read')
  const ref = await signOffOf(link)
  if (!ref) throw new ConflictError('no revision of this link is signed off')
  const rev = await ReportRevision.findByPk(ref.reportId, { rejectOnEmpty: true })
  const now = requireCompleteSpec(link.spec, 'compared')
  const result = analyzeParsedLink(now)
  const d = diffLinks(rev.input, now, rev.result, result)
  return {
    from: { id: rev.id, label: revisionLabel(rev.number), verdict: rev.verdict, linkVersion: rev.linkVersion, state: rev.state },
    to: { id: link.id, label: `version ${link.version}`, verdict: result.verdict, linkVersion: link.version },
    verdict: d.verdict,
    inputs: groupInputs(d.inputs, rev.input, now),
    margins: d.margins,
  }
})
