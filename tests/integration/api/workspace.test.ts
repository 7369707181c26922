import { beforeAll, describe, expect, it } from 'vitest'
import { buildWorld, type World } from '../../factories/world'
import { buildLink, buildLinkSpec, buildPart, buildPartBody, buildProject } from '../../factories/workspace'

let w: World

beforeAll(async () => {
  w = await buildWorld()
})

describe('projects', () => {
  it('creates, lists, renames with the version, and refuses a stale rename', async () => {
    const p = await buildProject(w.clients.engineer, w.teamId, 'Pump controller')
    expect(p.version).toBe(1)
    const list = await w.clients.viewer.get(`/api/teams/${w.teamId}/projects`)
    expect(list.data).toContainEqual(expect.objectContaining({ id: p.id, name: 'Pump controller', linkCount: 0 }))
    const renamed = await w.clients.engineer.patch(`/api/projects/${p.id}`, { version: 1, name: 'Pump controller B' })
    expect(renamed.status).toBe(200)
    expect(renamed.data).toMatchObject({ name: 'Pump controller B', version: 2, role: 'engineer', links: [] })
    const stale = await w.clients.admin.patch(`/api/projects/${p.id}`, { version: 1, name: 'Lost update' })
    expect(stale.status).toBe(409)
    expect(stale.data.data).toMatchObject({ currentVersion: 2, project: { name: 'Pump controller B' } })
  })
})

describe('links', () => {
  it('stores the spec, answers the project page with cached summaries from the engine', async () => {
    const p = await buildProject(w.clients.engineer, w.teamId)
    const telemetry = await buildLink(w.clients.engineer, p.id, buildLinkSpec('telemetry'))
    await buildLink(w.clients.engineer, p.id, buildLinkSpec('spi'))
    const detail = await w.clients.viewer.get(`/api/projects/${p.id}`)
    expect(detail.status).toBe(200)
    expect(detail.data.role).toBe('viewer')
    const byName = Object.fromEntries(detail.data.links.map((l: { name: string }) => [l.name, l]))
    // the demo telemetry link fails at its specified 38400 baud (product.md)
    expect(byName['Gate-driver telemetry UART']).toMatchObject({ id: telemetry.id, protocol: 'uart', version: 1, verdict: 'fail', maxSclkHz: null })
    expect(byName['Gate-driver telemetry UART'].worstMarginUi).toBeLessThan(0)
    expect(byName['Current-sense ADC SPI']).toMatchObject({ protocol: 'spi', maxBaud: null, worstMarginUi: null })
    expect(byName['Current-sense ADC SPI'].maxSclkHz).toBeGreaterThan(0)

    const link = await w.clients.reviewer.get(`/api/links/${telemetry.id}`)
    expect(link.data).toMatchObject({ id: telemetry.id, projectId: p.id, teamId: w.teamId, version: 1, role: 'reviewer', updatedBy: { id: w.users.engineer.id } })
    expect(link.data.spec.channels[0].stages[0].rl).toBe(4700)
    // defaults filled by the schema are stored
    expect(link.data.spec.uart.rx.sampler).toBe('ticks')

    const analysis = await w.clients.viewer.get(`/api/links/${telemetry.id}/analysis`)
    expect(analysis.status).toBe(200)
    expect(analysis.data.verdict).toBe('fail')
    expect(analysis.data.engineVersion).toEqual(expect.any(String))
  })

  it('a concurrent edit: the second save on the same version gets 409 with the current link', async () => {
    const p = await buildProject(w.clients.engineer, w.teamId)
    const l = await buildLink(w.clients.engineer, p.id, buildLinkSpec('telemetry'))
    const mine = buildLinkSpec('telemetry', 'Telemetry, 2.2k pull-up')
    ;(mine.channels[0]!.stages[0] as { rl: number }).rl = 2200
    const theirs = buildLinkSpec('telemetry', 'Telemetry at 19200')
    theirs.uart!.baud = 19200
    const [a, b] = await Promise.all([
      w.clients.engineer.patch(`/api/links/${l.id}`, { version: 1, spec: mine }),
      w.clients.admin.patch(`/api/links/${l.id}`, { version: 1, spec: theirs }),
    ])
    const statuses = [a.status, b.status].sort()
    expect(statuses).toEqual([200, 409])
    const winner = a.status === 200 ? a : b
    const loser = a.status === 200 ? b : a
    expect(winner.data.version).toBe(2)
    expect(loser.data.statusMessage).toMatch(/changed by someone else/)
    expect(loser.data.data.currentVersion).toBe(2)
    expect(loser.data.data.link).toMatchObject({ id: l.id, version: 2, name: winner.data.name })
    // nothing was overwritten silently
    const now = await w.clients.viewer.get(`/api/links/${l.id}`)
    expect(now.data.name).toBe(winner.data.name)
    // saving on top of the current version works
    const retry = loser === a ? w.clients.engineer : w.clients.admin
    expect((await retry.patch(`/api/links/${l.id}`, { version: 2, spec: mine })).status).toBe(200)
  })

  it('a save updates the cached summary (the telemetry link passes at a low baud)', async () => {
    const p = await buildProject(w.clients.engineer, w.teamId)
    const l = await buildLink(w.clients.engineer, p.id, buildLinkSpec('telemetry'))
    const slow = buildLinkSpec('telemetry')
    slow.uart!.baud = 2400
    const res = await w.clients.engineer.patch(`/api/links/${l.id}`, { version: 1, spec: slow })
    expect(res.status).toBe(200)
    expect(res.data.summary.verdict).toBe('pass')
    const detail = await w.clients.viewer.get(`/api/projects/${p.id}`)
    expect(detail.data.links[0]).toMatchObject({ id: l.id, version: 2, verdict: 'pass' })
  })

  it('400 names the failing field of the spec', async () => {
    const p = await buildProject(w.clients.engineer, w.teamId)
    const bad = buildLinkSpec('telemetry')
    bad.channels[0]!.receiver.vih = 'high' as unknown as number
    const res = await w.clients.engineer.post(`/api/projects/${p.id}/links`, { spec: bad })
    expect(res.status).toBe(400)
    expect(res.data.statusMessage).toMatch(/^spec\.channels\.0\.receiver\.vih: /)
    expect(res.data.data.issues[0].path).toEqual(['spec', 'channels', 0, 'receiver', 'vih'])
    const l = await buildLink(w.clients.engineer, p.id)
    const noVersion = await w.clients.engineer.patch(`/api/links/${l.id}`, { spec: buildLinkSpec() })
    expect(noVersion.status).toBe(400)
    expect(noVersion.data.statusMessage).toMatch(/^version: /)
  })

  it('deletes a link and the project (admin), with audit rows', async () => {
    const p = await buildProject(w.clients.engineer, w.teamId, 'Short-lived')
    const l = await buildLink(w.clients.engineer, p.id)
    expect((await w.clients.engineer.delete(`/api/links/${l.id}`)).status).toBe(204)
    expect((await w.clients.engineer.get(`/api/links/${l.id}`)).status).toBe(404)
    expect((await w.clients.engineer.delete(`/api/projects/${p.id}`)).status).toBe(403)
    expect((await w.clients.admin.delete(`/api/projects/${p.id}`)).status).toBe(204)
    const audit = await w.clients.admin.get(`/api/teams/${w.teamId}/audit?limit=20`)
    const mine = audit.data.filter((a: { entityId: number; entity: string }) => (a.entity === 'link' && a.entityId === l.id) || (a.entity === 'project' && a.entityId === p.id))
    expect(mine.map((a: { action: string }) => a.action)).toEqual(['project.delete', 'link.delete', 'link.create', 'project.create'])
  })
})

describe('part library', () => {
  it('lists the built-in parts first, then the team parts; built-ins are read-only', async () => {
    const own = await buildPart(w.clients.engineer, w.teamId, 'Team coupler')
    const list = await w.clients.viewer.get(`/api/teams/${w.teamId}/parts`)
    expect(list.status).toBe(200)
    const builtIn = list.data.filter((p: { builtIn: boolean }) => p.builtIn)
    // issue 17: generic class parameter sets for the stage classes a team meets, each marked generic
    expect(new Set(builtIn.map((p: { category: string }) => p.category))).toEqual(
      new Set(['phototransistor coupler', 'Darlington coupler', 'high-speed transistor coupler', 'logic-output coupler', 'digital isolator', 'transceiver', 'Schmitt buffer', 'buffer', 'cable']),
    )
    for (const p of builtIn.filter((x: { category: string }) => x.category !== 'cable')) expect(p.description).toMatch(/Generic: replace with your part's datasheet values/)
    expect(list.data.findIndex((p: { id: number }) => p.id === own.id)).toBeGreaterThanOrEqual(builtIn.length)
    const ptc = builtIn.find((p: { category: string }) => p.category === 'phototransistor coupler')
    expect(ptc.stage.kind).toBe('phototransistor')
    expect((await w.clients.outsider.get(`/api/parts/${ptc.id}`)).status).toBe(200)
    expect((await w.clients.admin.patch(`/api/parts/${ptc.id}`, { version: ptc.version, name: 'mine now' })).status).toBe(403)
    expect((await w.clients.admin.delete(`/api/parts/${ptc.id}`)).status).toBe(403)
  })

  it('edits a team part with its version; a stale edit is 409 with the current part', async () => {
    const part = await buildPart(w.clients.engineer, w.teamId, 'Versioned coupler')
    const ok = await w.clients.engineer.patch(`/api/parts/${part.id}`, { version: 1, description: 'tested' })
    expect(ok.data).toMatchObject({ version: 2, description: 'tested', builtIn: false })
    const stale = await w.clients.admin.patch(`/api/parts/${part.id}`, { version: 1, name: 'overwrite' })
    expect(stale.status).toBe(409)
    expect(stale.data.data).toMatchObject({ currentVersion: 2, part: { name: 'Versioned coupler' } })
    const badStage = { ...buildPartBody(), stage: { kind: 'digital', name: 'x' } }
    const res = await w.clients.engineer.post(`/api/teams/${w.teamId}/parts`, badStage)
    expect(res.status).toBe(400)
    expect(res.data.statusMessage).toMatch(/^stage\./)
  })
})

describe('compute routes', () => {
  it('analyses an unsaved link for any signed-in user; 400 names the field', async () => {
    const res = await w.clients.viewer.post('/api/analyze', buildLinkSpec('telemetry'))
    expect(res.status).toBe(200)
    expect(res.data.verdict).toBe('fail')
    const bad = buildLinkSpec('telemetry')
    bad.uart!.baud = -5
    const invalid = await w.clients.viewer.post('/api/analyze', bad)
    expect(invalid.status).toBe(400)
    expect(invalid.data.statusMessage).toMatch(/^uart\.baud: /)
  })

  it('runs the pull-up sweep and the spread study, validating their options', async () => {
    const sweep = await w.clients.viewer.post('/api/analyze/pullup-sweep', {
      link: buildLinkSpec('telemetry'),
      channelId: 'telemetry',
      stageIndex: 0,
      options: { series: 'E12', rlMin: 470, rlMax: 10000 },
    })
    expect(sweep.status).toBe(200)
    expect(sweep.data.rows.length).toBeGreaterThan(5)
    const badSeries = await w.clients.viewer.post('/api/analyze/pullup-sweep', { link: buildLinkSpec('telemetry'), channelId: 'telemetry', stageIndex: 0, options: { series: 'E7', rlMin: 1, rlMax: 2 } })
    expect(badSeries.status).toBe(400)
    expect(badSeries.data.statusMessage).toMatch(/^options\.series: /)
    const notPhoto = await w.clients.viewer.post('/api/analyze/pullup-sweep', { link: buildLinkSpec('debug'), channelId: 'debug-tx', stageIndex: 0, options: { series: 'E12', rlMin: 470, rlMax: 10000 } })
    expect(notPhoto.status).toBe(400)

    const spread = await w.clients.viewer.post('/api/analyze/spread', { link: buildLinkSpec('debug'), trials: 200, seed: 7 })
    expect(spread.status).toBe(200)
    const again = await w.clients.viewer.post('/api/analyze/spread', { link: buildLinkSpec('debug'), trials: 200, seed: 7 })
    // seeded: the same result again (only the measured run time differs)
    const { elapsedMs: _a, ...first } = spread.data
    const { elapsedMs: _b, ...second } = again.data
    expect(second).toEqual(first)
    const tooMany = await w.clients.viewer.post('/api/analyze/spread', { link: buildLinkSpec('debug'), trials: 100001, seed: 7 })
    expect(tooMany.status).toBe(400)
    expect(tooMany.data.statusMessage).toMatch(/^trials: /)
  })
})

describe('config', () => {
  it('has no mail inbox link outside demo and development', async () => {
    const res = await w.clients.signedOut.get('/api/config')
    expect(res.status).toBe(200)
    expect(res.data).toEqual({ mailInboxUrl: null })
  })
})
