/**
 * I2C, CAN and RS-485 links through the API (issue 15): created, analysed, refused with a 400 that
 * names the field, frozen, exported as PDF, CSV and JSON and imported again; a stored version 1
 * link is read after the schema-version migration.
 */
import { execFileSync } from 'node:child_process'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { Link } from '../../../server/db/models'
import { analyzeLink } from '../../../server/timing'
import { formatEng } from '../../../shared/utils/units'
import { useTestDb } from '../../factories/db'
import { FACTORY_PASSWORD } from '../../factories/users'
import { buildLink, buildLinkSpec, buildProject } from '../../factories/workspace'
import { buildWorld, type World } from '../../factories/world'

let w: World
let projectId: number
const ids: Record<'i2c' | 'can' | 'rs485', number> = { i2c: 0, can: 0, rs485: 0 }
const dir = mkdtempSync(path.join(tmpdir(), 'bitslack-bus-'))

beforeAll(async () => {
  w = await buildWorld()
  projectId = (await buildProject(w.clients.engineer, w.teamId, 'Bus project')).id
  for (const k of ['i2c', 'can', 'rs485'] as const) ids[k] = (await buildLink(w.clients.engineer, projectId, buildLinkSpec(k))).id
})
afterAll(() => rmSync(dir, { recursive: true, force: true }))

async function pdfOf(p: string): Promise<string> {
  const base = inject('baseURL')
  const signIn = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: w.users.viewer.email, password: FACTORY_PASSWORD }) })
  const cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ')
  const res = await fetch(`${base}${p}`, { headers: { cookie } })
  expect(res.status).toBe(200)
  const file = path.join(dir, `${Math.random().toString(36).slice(2)}.pdf`)
  writeFileSync(file, Buffer.from(await res.arrayBuffer()))
  return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
}

describe('analysis of the new link types', () => {
  it('the analysis route returns the contract fields for each', async () => {
    const i2c = await w.clients.viewer.post('/api/analyze', buildLinkSpec('i2c'))
    expect(i2c.status, JSON.stringify(i2c.data).slice(0, 300)).toBe(200)
    expect(i2c.data.i2c.checks[0]).toMatchObject({ id: expect.any(String), slack: expect.any(Number), pass: expect.any(Boolean) })
    expect(i2c.data.i2c.maxSclHz).toBeGreaterThan(0)
    const can = await w.clients.viewer.post('/api/analyze', buildLinkSpec('can'))
    expect(can.data.can.bitTimings[0]).toMatchObject({ brp: expect.any(Number), tq: expect.any(Number), propSeg: expect.any(Number), phaseSeg1: expect.any(Number), phaseSeg2: expect.any(Number), sjw: expect.any(Number), samplePoint: expect.any(Number), tolerance: expect.any(Number), loopDelayFits: expect.any(Boolean) })
    expect(can.data.can.maxBusLength).toBeGreaterThan(0)
    const rs = await w.clients.viewer.post('/api/analyze', buildLinkSpec('rs485'))
    expect(rs.data.verdict).toBe('fail')
    expect(rs.data.rs485.limiting).toBe('de-lead')
    // the saved link's summary says the same
    const list = await w.clients.viewer.get(`/api/projects/${projectId}`)
    const rows = list.data.links as { id: number; verdict: string; limitingCheck?: string; maxSclHz?: number; maxBusLength?: number }[]
    expect(rows.find((l) => l.id === ids.rs485)).toMatchObject({ verdict: 'fail', limitingCheck: 'de-lead' })
    expect(rows.find((l) => l.id === ids.i2c)!.maxSclHz).toBeCloseTo(i2c.data.i2c.maxSclHz, 3)
    expect(rows.find((l) => l.id === ids.can)!.maxBusLength).toBeCloseTo(can.data.can.maxBusLength, 6)
  })

  it('bad input gets a 400 naming the field, never NaN', async () => {
    const low = buildLinkSpec('i2c')
    low.i2c!.target.rp = 500
    const a = await w.clients.engineer.post('/api/analyze', low)
    expect(a.status).toBe(400)
    expect(JSON.stringify(a.data)).toMatch(/i2c\.target\.rp/)
    const imp = buildLinkSpec('can')
    imp.can!.clockHz = 10e6
    imp.can!.bitRate = 333e3
    const b = await w.clients.engineer.post('/api/analyze', imp)
    expect(b.status).toBe(400)
    expect(JSON.stringify(b.data)).toMatch(/can\.clockHz/)
    const sp = buildLinkSpec('can')
    sp.can!.samplePoint = 1.5
    const c = await w.clients.engineer.post('/api/analyze', sp)
    expect(c.status).toBe(400)
    expect(JSON.stringify(c.data)).toMatch(/can\.samplePoint/)
    // a save of the same is refused the same way
    const save = await w.clients.engineer.post(`/api/projects/${projectId}/links`, { spec: low })
    expect(save.status).toBe(400)
    expect(JSON.stringify(save.data)).toMatch(/i2c\.target\.rp/)
  })
})

describe('reports of the new link types', () => {
  for (const kind of ['i2c', 'can', 'rs485'] as const)
    it(`${kind}: frozen, signed off, exported as PDF, CSV and JSON, and imported again`, async () => {
      const r = (await w.clients.engineer.post(`/api/links/${ids[kind]}/reports`, {})).data
      expect(r.protocol).toBe(kind)
      expect(r.result).toEqual(JSON.parse(JSON.stringify(analyzeLink(buildLinkSpec(kind)))))
      expect((await w.clients.engineer.post(`/api/reports/${r.id}/submit`, { reviewerId: w.users.reviewer.id })).status).toBe(200)
      expect((await w.clients.reviewer.post(`/api/reports/${r.id}/sign-off`, {})).status).toBe(200)

      const text = await pdfOf(`/reports/${r.id}/report.pdf`)
      expect(text).toContain(buildLinkSpec(kind).name)
      expect(text).toContain('Safety caution')
      if (kind === 'i2c') {
        expect(text).toContain('I2C checks')
        expect(text).toContain(formatEng(r.result.i2c.maxSclHz, 'Hz'))
      }
      if (kind === 'can') {
        expect(text).toContain('Bit-timing table')
        expect(text).toContain('CAN FD data phase')
      }
      if (kind === 'rs485') {
        expect(text).toContain('RS-485 turnaround')
        expect(text).toContain('de-lead')
      }

      const table = kind === 'can' ? 'can-bit-timing' : 'bus-checks'
      const csv = await w.clients.viewer.request('GET', `/reports/${r.id}/tables.csv?table=${table}`, undefined, { accept: 'text/csv' })
      expect(csv.status).toBe(200)
      const lines = String(csv.data).trim().split('\r\n')
      const rows = kind === 'can' ? r.result.can.bitTimings : (r.result.i2c ?? r.result.rs485).checks
      expect(lines).toHaveLength(1 + rows.length)
      if (kind === 'can') expect(lines[0]).toMatch(/^brp,tq \(s\),tq per bit,Prop_Seg \(tq\)/)
      else expect(Number(lines[1]!.split(',')[3])).toBe(rows[0].slack)

      const dl = await w.clients.viewer.request('GET', `/reports/${r.id}/link.json`)
      const json = typeof dl.data === 'string' ? JSON.parse(dl.data) : dl.data
      expect(json.schemaVersion).toBe(2)
      const imported = await w.clients.engineer.post(`/api/projects/${projectId}/links/import`, json)
      expect(imported.status, JSON.stringify(imported.data).slice(0, 300)).toBe(201)
      const again = await w.clients.viewer.get(`/api/links/${imported.data.id}/analysis`)
      expect(again.data).toEqual(r.result)
    })
})

describe('schema version 2', () => {
  it('a link stored as version 1 is still read and analysed, and the migration moves it to 2', async () => {
    useTestDb()
    const id = (await buildLink(w.clients.engineer, projectId, { ...buildLinkSpec('debug', 'Old link'), schemaVersion: 1 })).id
    const row = await Link.findByPk(id)
    expect(row!.spec.schemaVersion).toBe(1)
    const analysis = await w.clients.viewer.get(`/api/links/${id}/analysis`)
    expect(analysis.status).toBe(200)
    const { up } = await import('../../../server/db/migrations/20261204000100-link-schema-v2')
    await up({ context: Link.sequelize!.getQueryInterface() } as never)
    await row!.reload()
    expect(row!.spec.schemaVersion).toBe(2)
  })
})
