/**
 * Bounded payloads: a link with 100 large captures (each a real extraction of a long bench
 * capture: some 2,000 edges per channel and 2,000 input/output pairs) lists a page of
 * summaries, serves each capture's whole result and waveform on demand, and renders its link
 * page within the same budget as a link without captures.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import { Capture } from '../../../server/db/models'
import type { CaptureDetailDto, CaptureDto, CaptureWaveform } from '../../../shared/types/capture'
import { buildWorld, type World } from '../../factories/world'
import { buildLink, buildLinkSpec, buildProject } from '../../factories/workspace'
import { largeExtraction, storedCaptures } from '../../factories/captures'
import { useTestDb } from '../../factories/db'

const CAPTURES = 100
/** the budget for the link page's server-rendered HTML (with its payload) */
const PAGE_BUDGET = 200_000

let w: World
let crowded: number
let empty: number
let projectId: number
let builtInPartId: number

beforeAll(async () => {
  w = await buildWorld()
  const project = await buildProject(w.clients.engineer, w.teamId)
  projectId = project.id
  builtInPartId = (await w.clients.viewer.get(`/api/teams/${w.teamId}/parts`)).data.find((p: { builtIn: boolean }) => p.builtIn).id
  crowded = (await buildLink(w.clients.engineer, project.id, buildLinkSpec('telemetry', 'Crowded link'))).id
  empty = (await buildLink(w.clients.engineer, project.id, buildLinkSpec('telemetry', 'Empty link'))).id
  const { result, waveform } = await largeExtraction()
  expect(result.channels[0]!.edgeCount).toBeGreaterThan(1500)
  useTestDb()
  const rows = storedCaptures({ linkId: crowded, teamId: w.teamId, ownerId: w.users.engineer.id, count: CAPTURES, keyPrefix: 'captures/test' }, { result, waveform })
  await Capture.bulkCreate(rows)
}, 120_000)

describe('capture lists carry summaries, a page at a time', () => {
  it('the first page holds 20 summaries, newest first, with the total and the next page in headers', async () => {
    const res = await w.clients.viewer.get<CaptureDto[]>(`/api/links/${crowded}/captures`)
    expect(res.status).toBe(200)
    expect(res.data).toHaveLength(20)
    expect(res.headers.get('x-total-count')).toBe(String(CAPTURES))
    expect(res.headers.get('link')).toMatch(/<\/api\/links\/\d+\/captures\?limit=20&offset=20>; rel="next"/)
    const ids = res.data.map((c) => c.id)
    expect([...ids].sort((a, b) => b - a)).toEqual(ids)
    const first = res.data[0]!
    expect(first.result!.pairing!.pairCount).toBeGreaterThan(1500)
    expect(first.result!.pairing!.tPLH!.mean).toBeCloseTo(300e-9, 8)
    expect(first.result!.channels[0]).not.toHaveProperty('edges')
    expect(first.result!.pairing).not.toHaveProperty('pairs')
    // a page of summaries stays small however large each result is
    expect(JSON.stringify(res.data).length).toBeLessThan(60_000)
  })

  it('pages follow each other without overlap; the page size is bounded', async () => {
    const seen = new Set<number>()
    for (let offset = 0; offset < CAPTURES; offset += 40) {
      const page = await w.clients.viewer.get<CaptureDto[]>(`/api/links/${crowded}/captures?limit=40&offset=${offset}`)
      for (const c of page.data) seen.add(c.id)
    }
    expect(seen.size).toBe(CAPTURES)
    const tooMany = await w.clients.viewer.get(`/api/links/${crowded}/captures?limit=101`)
    expect(tooMany.status).toBe(400)
    expect(tooMany.data.statusMessage).toMatch(/^limit: /)
  })

  it('one capture returns its whole result; its waveform comes merged to the plot width, every extreme kept', async () => {
    const [one] = (await w.clients.viewer.get<CaptureDto[]>(`/api/links/${crowded}/captures?limit=1`)).data
    const detail = await w.clients.viewer.get<CaptureDetailDto>(`/api/captures/${one!.id}`)
    expect(detail.data.result!.channels[0]!.edges.length).toBeGreaterThan(1500)
    expect(detail.data.result!.pairing!.pairs.length).toBeGreaterThan(1500)
    const full = (await w.clients.viewer.get<CaptureWaveform>(`/api/captures/${one!.id}/waveform`)).data
    const narrow = (await w.clients.viewer.get<CaptureWaveform>(`/api/captures/${one!.id}/waveform?width=300`)).data
    expect(narrow.t.length).toBeLessThanOrEqual(300)
    expect(narrow.t.length).toBeGreaterThan(150)
    for (const [i, c] of narrow.channels.entries()) {
      expect(Math.min(...c.min)).toBe(Math.min(...full.channels[i]!.min))
      expect(Math.max(...c.max)).toBe(Math.max(...full.channels[i]!.max))
    }
    expect((await w.clients.viewer.get(`/api/captures/${one!.id}/waveform?width=5`)).status).toBe(400)
  })
})

describe('the link page with 100 large captures', () => {
  it(`renders under ${PAGE_BUDGET / 1000} kB, within a few kB of the same link without captures`, async () => {
    const withCaptures = await w.clients.viewer.get<string>(`/links/${crowded}`)
    const without = await w.clients.viewer.get<string>(`/links/${empty}`)
    expect(withCaptures.status).toBe(200)
    expect(withCaptures.data).toContain('Crowded link')
    const bytes = Buffer.byteLength(withCaptures.data)
    expect(bytes).toBeLessThan(PAGE_BUDGET)
    // the browser fetches the capture list (a page of summaries) after the first paint: the captures add nothing to the render
    expect(Math.abs(bytes - Buffer.byteLength(without.data))).toBeLessThan(5_000)
  })
})

describe('other lists are paginated the same way', () => {
  it.each([
    ['parts', () => `/api/teams/${w.teamId}/parts`, 500],
    ['project links', () => `/api/projects/${projectId}/links`, 500],
    ['report revisions', () => `/api/links/${crowded}/reports`, 200],
    ['part datasheets', () => `/api/parts/${builtInPartId}/datasheets`, 200],
  ] as const)('%s: ?limit=1 gives one row and the total; a page over %s rows is refused', async (_name, path, max) => {
    const res = await w.clients.viewer.get<unknown[]>(`${path()}?limit=1`)
    expect(res.status).toBe(200)
    expect(res.data.length).toBeLessThanOrEqual(1)
    expect(Number(res.headers.get('x-total-count'))).toBeGreaterThanOrEqual(res.data.length)
    const over = await w.clients.viewer.get(`${path()}?limit=${max + 1}`)
    expect(over.status).toBe(400)
    expect(over.data.statusMessage).toMatch(/^limit: /)
  })
})
