/**
 * Comparing revisions for a reviewer: two revisions of one link with known differences (the
 * baud rate and a stage's name changed between r1 and r2) compared from their frozen inputs and
 * results, on the API and in the PDF of r2 ("changes since r1"); the errors of a comparison that
 * cannot be made.
 */
import { execFileSync } from 'node:child_process'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { buildLink, buildLinkSpec, buildProject } from '../../factories/workspace'
import { buildWorld, type World } from '../../factories/world'

let w: World
let linkId: number
let r1: { id: number; result: { verdict: string; uart: { worstMarginUi: number; maxBaud: number } } }
let r2: typeof r1
const dir = mkdtempSync(path.join(tmpdir(), 'bitslack-compare-'))

async function freeze(id: number) {
  const res = await w.clients.engineer.post(`/api/links/${id}/reports`, {})
  expect(res.status, JSON.stringify(res.data)).toBe(201)
  return (await w.clients.engineer.get(`/api/reports/${res.data.id}`)).data
}

async function pdfText(reportId: number): Promise<string> {
  const res = await fetch(`${inject('baseURL')}/reports/${reportId}/report.pdf`, { headers: { cookie: w.clients.viewer.cookie } })
  expect(res.status).toBe(200)
  const file = path.join(dir, `r-${reportId}.pdf`)
  writeFileSync(file, Buffer.from(await res.arrayBuffer()))
  return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
}

beforeAll(async () => {
  w = await buildWorld()
  const projectId = (await buildProject(w.clients.engineer, w.teamId, 'Compare project')).id
  linkId = (await buildLink(w.clients.engineer, projectId, buildLinkSpec('telemetry'))).id
  r1 = await freeze(linkId)
  const link = (await w.clients.engineer.get(`/api/links/${linkId}`)).data
  const spec = structuredClone(link.spec)
  spec.uart.baud = 9600
  spec.channels[0].stages[0].name = 'Coupler after the layout change'
  expect((await w.clients.engineer.patch(`/api/links/${linkId}`, { version: link.version, spec })).status).toBe(200)
  r2 = await freeze(linkId)
})
afterAll(() => rmSync(dir, { recursive: true, force: true }))

describe('GET /api/reports/:id/compare', () => {
  it('r2 against the revision before it: the two changed inputs by group, the verdicts, the margins biggest change first', async () => {
    const res = await w.clients.viewer.get(`/api/reports/${r2.id}/compare`)
    expect(res.status).toBe(200)
    const c = res.data
    expect(c.from).toMatchObject({ id: r1.id, label: 'r1' })
    expect(c.to).toMatchObject({ id: r2.id, label: 'r2' })
    expect(c.verdict).toEqual({ a: r1.result.verdict, b: r2.result.verdict })
    const paths = c.inputs.flatMap((g: { changes: { path: string }[] }) => g.changes.map((x) => x.path))
    expect(paths.sort()).toEqual(['channels.0.stages.0.name', 'uart.baud'])
    expect(c.inputs.map((g: { title: string }) => g.title)).toEqual(expect.arrayContaining(['UART settings', expect.stringMatching(/^channel \S+: stage 1 \(Coupler after the layout change\)$/)]))
    expect(c.inputs.find((g: { title: string }) => g.title === 'UART settings').changes).toEqual([{ path: 'uart.baud', a: 38400, b: 9600 }])
    // the margins are the frozen results' own
    const worst = c.margins.find((m: { what: string }) => m.what === 'worst margin')
    expect(worst.a).toBe(r1.result.uart.worstMarginUi)
    expect(worst.b).toBe(r2.result.uart.worstMarginUi)
    expect(worst.change).toBeCloseTo(r2.result.uart.worstMarginUi - r1.result.uart.worstMarginUi, 12)
    const ui = c.margins.filter((m: { unit: string; change: number | null }) => m.unit === 'UI' && m.change !== null).map((m: { change: number }) => Math.abs(m.change))
    expect(ui.length).toBeGreaterThan(5)
    expect(ui).toEqual([...ui].sort((x: number, y: number) => y - x))
    // ?with= in either order says the same
    const back = await w.clients.viewer.get(`/api/reports/${r1.id}/compare?with=${r2.id}`)
    expect(back.data).toEqual(c)
  })

  it('refuses what cannot be compared: a first revision alone (409), another link\'s revision (400 naming with), another team (404)', async () => {
    expect((await w.clients.viewer.get(`/api/reports/${r1.id}/compare`)).status).toBe(409)
    const other = await freeze((await buildLink(w.clients.engineer, (await buildProject(w.clients.engineer, w.teamId, 'Other')).id, buildLinkSpec('debug'))).id)
    const cross = await w.clients.viewer.get(`/api/reports/${r2.id}/compare?with=${other.id}`)
    expect(cross.status).toBe(400)
    expect(cross.data.message).toContain('with')
    expect((await w.clients.outsider.get(`/api/reports/${r2.id}/compare`)).status).toBe(404)
    expect((await w.clients.signedOut.get(`/api/reports/${r2.id}/compare`)).status).toBe(401)
  })
})

describe('the PDF of a revision after r1', () => {
  it('has a "Changes since" section with the changed inputs and margins; r1 has none', async () => {
    const text = await pdfText(r2.id)
    expect(text).toContain('Changes since r1')
    expect(text).toContain('uart.baud')
    expect(text.replace(/\s+/g, ' ')).toContain('38400 -> 9600')
    expect(text).toContain('Margins, biggest change first')
    expect(await pdfText(r1.id)).not.toContain('Changes since')
  })
})

describe('a sign-off never silently outlives its link', () => {
  it('after r2 is signed off, a saved change marks the link "changed since r2" on the link and the project list, with what changed one call away', async () => {
    expect((await w.clients.engineer.post(`/api/reports/${r2.id}/submit`, { reviewerId: w.users.reviewer.id })).status).toBe(200)
    expect((await w.clients.reviewer.post(`/api/reports/${r2.id}/sign-off`, {})).status).toBe(200)
    let link = (await w.clients.viewer.get(`/api/links/${linkId}`)).data
    expect(link.signedOff).toMatchObject({ reportId: r2.id, label: 'r2', linkVersion: link.version, changedSince: false })
    expect((await w.clients.viewer.get(`/api/links/${linkId}/since-sign-off`)).data.inputs).toEqual([])

    const spec = structuredClone(link.spec)
    spec.uart.baud = 19200
    const saved = await w.clients.engineer.patch(`/api/links/${linkId}`, { version: link.version, spec })
    expect(saved.status).toBe(200)
    expect(saved.data.signedOff).toMatchObject({ label: 'r2', changedSince: true })
    link = (await w.clients.viewer.get(`/api/links/${linkId}`)).data
    expect(link.signedOff).toMatchObject({ reportId: r2.id, changedSince: true })
    const project = (await w.clients.viewer.get(`/api/projects/${link.projectId}`)).data
    expect(project.links.find((l: { id: number }) => l.id === linkId).signedOff).toMatchObject({ label: 'r2', changedSince: true })

    const since = await w.clients.viewer.get(`/api/links/${linkId}/since-sign-off`)
    expect(since.status).toBe(200)
    expect(since.data.from).toMatchObject({ id: r2.id, label: 'r2', state: 'signed-off' })
    expect(since.data.to).toMatchObject({ label: `version ${link.version}`, linkVersion: link.version })
    expect(since.data.inputs.flatMap((g: { changes: unknown[] }) => g.changes)).toEqual([{ path: 'uart.baud', a: 9600, b: 19200 }])
    // the signed-off revision itself is as it was signed
    const rev = (await w.clients.viewer.get(`/api/reports/${r2.id}`)).data
    expect(rev.state).toBe('signed-off')
    expect(rev.input.uart.baud).toBe(9600)
  })
})
