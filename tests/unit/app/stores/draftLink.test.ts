import { createPinia, setActivePinia } from 'pinia'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { useDraftLinkStore } from '../../../../app/stores/draftLink'
import { LinkSpec } from '../../../../shared/schemas/link'
import type { LinkDto } from '../../../../shared/types/workspace'
import type { LinkAnalysis, PullupSweepRow } from '../../../../shared/types/analysis'
import { TELEMETRY_LINK } from '../../../../server/db/seeders/demo-links'

const spec = LinkSpec.parse(TELEMETRY_LINK)
const dto = (version: number, s = spec): LinkDto => ({
  id: 7,
  projectId: 1,
  teamId: 1,
  name: s.name,
  version,
  spec: JSON.parse(JSON.stringify(s)),
  summary: { verdict: 'fail', missingValues: 0, worstMarginUi: -0.9, worstSlack: null, maxBaud: 7000, maxSclkHz: null, engineVersion: '1.0.0' },
  createdAt: '2026-12-01T00:00:00.000Z',
  updatedAt: '2026-12-01T00:00:00.000Z',
  updatedBy: null,
  role: 'engineer',
})
/** A failed $fetch as ofetch throws it: status and the API's payload. */
const fetchError = (status: number, data: unknown) => Object.assign(new Error(`HTTP ${status}`), { statusCode: status, data })

let fetchMock: ReturnType<typeof vi.fn>
beforeEach(() => {
  setActivePinia(createPinia())
  fetchMock = vi.fn()
  vi.stubGlobal('$fetch', fetchMock)
})
afterEach(() => vi.unstubAllGlobals())

describe('draft link store: reading the draft', () => {
  it('loads a link: the draft equals the saved spec, not dirty; an edit makes it dirty; key order never does', () => {
    const s = useDraftLinkStore()
    s.load(dto(3))
    expect(s.draft).toEqual(spec)
    expect(s.dirty).toBe(false)
    expect(s.valid).toBe(true)
    // jsonb returns keys reordered: still the same link
    const reordered = Object.fromEntries(Object.entries(JSON.parse(JSON.stringify(spec))).reverse())
    s.saved = { ...s.saved!, spec: reordered as never }
    expect(s.dirty).toBe(false)
    s.draft!.uart!.baud = 9600
    expect(s.dirty).toBe(true)
    s.revert()
    expect(s.draft!.uart!.baud).toBe(spec.uart!.baud)
  })

  it('tells values still missing (savable, not analysable) from fields to fix (neither)', () => {
    const s = useDraftLinkStore()
    s.load(dto(1))
    ;(s.draft!.uart as unknown as { baud: number | null }).baud = null
    expect(s.missingCount).toBe(1)
    expect(s.fixCount).toBe(0)
    expect(s.valid).toBe(false)
    expect(s.savable).toBe(true)
    expect(s.issues['uart.baud']).toBe('enter a value')
    s.draft!.uart!.baud = -5
    expect(s.fixCount).toBe(1)
    expect(s.savable).toBe(false)
    s.draft!.uart!.baud = 9600
    s.typing = { 'uart.requiredMarginUi': 'banana is not a number' }
    expect(s.fixCount).toBe(1)
    expect(s.valid).toBe(false)
  })
})

describe('draft link store: saving', () => {
  it('sends the version it edited and keeps edits made while the request was in flight', async () => {
    const s = useDraftLinkStore()
    s.load(dto(3))
    s.draft!.uart!.baud = 9600
    let resolve!: (v: LinkDto) => void
    fetchMock.mockReturnValueOnce(new Promise<LinkDto>((r) => (resolve = r)))
    const saving = s.save()
    expect(fetchMock).toHaveBeenCalledWith('/api/links/7', { method: 'PATCH', body: { version: 3, spec: expect.objectContaining({ name: spec.name }) } })
    expect(fetchMock.mock.calls[0]![1].body.spec.uart.baud).toBe(9600)
    expect(s.saving).toBe(true)
    // typed while saving
    s.draft!.uart!.baud = 4800
    resolve(dto(4, { ...spec, uart: { ...spec.uart!, baud: 9600 } }))
    expect(await saving).toBe(true)
    expect(s.saved!.version).toBe(4)
    expect(s.draft!.uart!.baud).toBe(4800)
    expect(s.dirty).toBe(true)
    expect(s.savedAt).not.toBeNull()
  })

  it('a stale version (409) opens a conflict: take theirs, or keep mine and save over their version', async () => {
    const s = useDraftLinkStore()
    s.load(dto(3))
    s.draft!.uart!.baud = 9600
    const theirs = dto(5, { ...spec, uart: { ...spec.uart!, baud: 2400 } })
    fetchMock.mockRejectedValueOnce(fetchError(409, { data: { currentVersion: 5, link: theirs } }))
    expect(await s.save()).toBe(false)
    expect(s.conflict).toEqual({ currentVersion: 5, link: theirs })
    expect(s.saveError).toBeNull()

    fetchMock.mockResolvedValueOnce(dto(6, { ...spec, uart: { ...spec.uart!, baud: 9600 } }))
    expect(await s.keepMine()).toBe(true)
    expect(fetchMock.mock.calls[1]![1].body.version).toBe(5)
    expect(fetchMock.mock.calls[1]![1].body.spec.uart.baud).toBe(9600)
    expect(s.conflict).toBeNull()

    s.draft!.uart!.baud = 1200
    fetchMock.mockRejectedValueOnce(fetchError(409, { data: { currentVersion: 7, link: dto(7, { ...spec, uart: { ...spec.uart!, baud: 300 } }) } }))
    await s.save()
    s.takeTheirs()
    expect(s.draft!.uart!.baud).toBe(300)
    expect(s.saved!.version).toBe(7)
    expect(s.conflict).toBeNull()
  })

  it('a refused save (400) names the fields the server named', async () => {
    const s = useDraftLinkStore()
    s.load(dto(1))
    fetchMock.mockRejectedValueOnce(fetchError(400, { message: 'invalid', issues: [{ path: ['uart', 'baud'], message: 'baud must be at most 100000000' }] }))
    expect(await s.save()).toBe(false)
    expect(s.saveError).toContain('baud must be at most')
    expect(s.issues['uart.baud']).toBe('baud must be at most 100000000')
    expect(s.conflict).toBeNull()
  })
})

describe('draft link store: the writes it owns', () => {
  it('applies an analysis and clears the earlier error; a failure keeps the issues; clearing drops the result', () => {
    const s = useDraftLinkStore()
    s.load(dto(1))
    s.beginAnalysis()
    s.failAnalysis('The analysis failed.', { 'uart.baud': 'too fast' })
    expect(s.analysing).toBe(false)
    expect(s.issues['uart.baud']).toBe('too fast')
    const a = { verdict: 'pass' } as LinkAnalysis
    s.applyAnalysis(a)
    expect(s.analysis).toEqual(a)
    expect(s.analysisError).toBeNull()
    expect(s.serverIssues).toEqual({})
    s.clearAnalysis()
    expect(s.analysis).toBeNull()
  })

  it('applies a sweep row to the phototransistor stage: pull-up, LED resistor in place of a current, RBE fitted or removed', () => {
    const s = useDraftLinkStore()
    s.load(dto(1))
    const ci = s.draft!.channels.findIndex((c) => c.stages.some((x) => x.kind === 'phototransistor'))
    const si = s.draft!.channels[ci]!.stages.findIndex((x) => x.kind === 'phototransistor')
    const row = { rl: 1200, rLed: 150, rbe: 100000 } as PullupSweepRow
    s.applySweepRow(ci, si, row)
    const st = s.draft!.channels[ci]!.stages[si]!
    expect(st).toMatchObject({ rl: 1200, rLed: 150, rbe: 100000 })
    expect('ledCurrent' in st).toBe(false)
    s.applySweepRow(ci, si, { ...row, rbe: null })
    expect('rbe' in s.draft!.channels[ci]!.stages[si]!).toBe(false)
    // a stage that is not a phototransistor (or none) is left alone
    const before = JSON.stringify(s.draft)
    s.applySweepRow(ci, si + 1, row)
    expect(JSON.stringify(s.draft)).toBe(before)
  })
})
