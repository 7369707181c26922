/**
 * A margin report revision DTO built from a link without the database: the engine's real
 * analysis of the link, frozen as the server freezes it.
 */
import type { LinkInput } from '../../shared/schemas/link'
import { DEFAULT_TEAM_POLICY } from '../../shared/schemas/team'
import type { ReportDetailDto } from '../../shared/types/report'
import { freezeAnalysis } from '../../server/reports/freeze'

export function buildReportDetail(link: LinkInput, overrides: Partial<ReportDetailDto> = {}): ReportDetailDto {
  const f = freezeAnalysis(JSON.parse(JSON.stringify(link)))
  const json = JSON.parse(JSON.stringify(f)) as typeof f
  return {
    id: 1,
    number: 1,
    label: 'r1',
    linkId: 1,
    linkName: json.input.name,
    projectId: 1,
    projectName: 'Demo project',
    teamId: 1,
    protocol: json.input.protocol,
    state: 'draft',
    verdict: json.verdict,
    engineVersion: json.engineVersion,
    author: { id: 1, name: 'Demo Engineer' },
    reviewer: null,
    createdAt: '2026-12-02T10:00:00.000Z',
    submittedAt: null,
    decidedAt: null,
    linkVersion: 1,
    input: json.input,
    result: json.result,
    assumptions: json.assumptions,
    pullup: json.pullup,
    thresholds: { guardBandUi: DEFAULT_TEAM_POLICY.guardBandUi, thinSlackFraction: DEFAULT_TEAM_POLICY.thinSlackFraction },
    captures: [],
    decidedBy: null,
    decisionNote: null,
    version: 1,
    events: [],
    comments: [],
    role: 'engineer',
    can: { submit: true, comment: true, decide: false, freeze: true },
    latestNumber: 1,
    ...overrides,
  }
}
