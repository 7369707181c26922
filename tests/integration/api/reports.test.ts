import { execFileSync } from 'node:child_process'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import { AuditEntry, ReportRevision } from '../../../server/db/models'
import { pdfText } from '../../../server/reports/pdf'
import { analyzeLink } from '../../../server/timing'
import { applyCaptureToStage } from '../../../shared/utils/capture-apply'
import { formatEng, formatUi } from '../../../shared/utils/units'
import { couplerCapture } from '../../factories/captures'
import { useTestDb } from '../../factories/db'
import { FACTORY_PASSWORD } from '../../factories/users'
import { buildLink, buildLinkSpec, buildProject } from '../../factories/workspace'
import { buildWorld, type World } from '../../factories/world'
import { mailsTo, waitForMail } from '../../support/mail'

let w: World
let projectId: number
let telemetryId: number
let spiLinkId: number
const dir = mkdtempSync(path.join(tmpdir(), 'bitslack-report-'))

beforeAll(async () => {
  w = await buildWorld()
  projectId = (await buildProject(w.clients.engineer, w.teamId, 'Report project')).id
  telemetryId = (await buildLink(w.clients.engineer, projectId, buildLinkSpec('telemetry'))).id
  spiLinkId = (await buildLink(w.clients.engineer, projectId, buildLinkSpec('spi'))).id
})
afterAll(() => rmSync(dir, { recursive: true, force: true }))

async function freeze(linkId = telemetryId, client = w.clients.engineer) {
  const res = await client.post(`/api/links/${linkId}/reports`, {})
  expect(res.status, JSON.stringify(res.data)).toBe(201)
  return res.data
}

describe('freezing a revision', () => {
  it('stores the full input, the engine result, version, assumptions, author; numbers r1, r2', async () => {
    const r1 = await freeze()
    expect(r1).toMatchObject({ label: expect.stringMatching(/^r\d+$/), state: 'draft', author: { id: w.users.engineer.id }, linkId: telemetryId, protocol: 'uart' })
    const expected = JSON.parse(JSON.stringify(analyzeLink(buildLinkSpec('telemetry'))))
    expect(r1.result).toEqual(expected)
    expect(r1.engineVersion).toBe(expected.engineVersion)
    expect(r1.assumptions).toEqual(expected.assumptions)
    expect(r1.input.name).toBe('Gate-driver telemetry UART')
    // the phototransistor stage's pull-up sweep is kept, with the row the link uses
    expect(r1.pullup.rl).toBe(4700)
    expect(r1.pullup.sweep.rows[r1.pullup.chosenRow].rl).toBe(4700)
    const r2 = await freeze()
    expect(r2.number).toBe(r1.number + 1)
    expect(r2.latestNumber).toBe(r2.number)
    const audit = await AuditEntry.findOne({ where: { entity: 'report', entityId: r1.id, action: 'report.freeze' } })
    expect(audit?.userId).toBe(w.users.engineer.id)
  })

  it('refuses viewers and reviewers (403), the signed out (401), other teams (404), stale link versions (409)', async () => {
    expect((await w.clients.viewer.post(`/api/links/${telemetryId}/reports`, {})).status).toBe(403)
    expect((await w.clients.reviewer.post(`/api/links/${telemetryId}/reports`, {})).status).toBe(403)
    expect((await w.clients.signedOut.post(`/api/links/${telemetryId}/reports`, {})).status).toBe(401)
    expect((await w.clients.outsider.post(`/api/links/${telemetryId}/reports`, {})).status).toBe(404)
    expect((await w.clients.engineer.post(`/api/links/${telemetryId}/reports`, { linkVersion: 999 })).status).toBe(409)
    expect((await w.clients.engineer.post(`/api/links/abc/reports`, {})).status).toBe(400)
  })

  it('a revision never changes: the database refuses an edit of its frozen result', async () => {
    const r = await freeze()
    useTestDb()
    await expect(ReportRevision.update({ verdict: 'pass', result: { tampered: true } as never }, { where: { id: r.id } })).rejects.toThrow(/immutable/)
    const again = await w.clients.viewer.get(`/api/reports/${r.id}`)
    expect(again.data.result).toEqual(r.result)
  })
})

describe('review flow', () => {
  it('submit -> mail to the reviewer -> comment on one bit -> sign off -> mail to the author; audit rows', async () => {
    const r = await freeze()
    const reviewers = await w.clients.engineer.get(`/api/reports/${r.id}/reviewers`)
    expect(reviewers.data.map((x: { id: number }) => x.id).sort()).toEqual([w.users.admin.id, w.users.reviewer.id].sort())

    const sub = await w.clients.engineer.post(`/api/reports/${r.id}/submit`, { reviewerId: w.users.reviewer.id })
    expect(sub.status, JSON.stringify(sub.data)).toBe(200)
    expect(sub.data).toMatchObject({ state: 'submitted', reviewer: { id: w.users.reviewer.id } })
    const toReviewer = await waitForMail(w.users.reviewer.email, { subject: `${r.label}` })
    expect(toReviewer.subject).toBe(`Margin report to review: Gate-driver telemetry UART ${r.label}`)
    expect(toReviewer.text).toContain(`/reports/${r.id}`)

    const queue = await w.clients.reviewer.get('/api/review-queue')
    expect(queue.data.find((q: { id: number }) => q.id === r.id)).toMatchObject({ assignedToMe: true, state: 'submitted' })
    expect((await w.clients.engineer.get('/api/review-queue')).data.find((q: { id: number }) => q.id === r.id)).toBeUndefined()

    const comment = await w.clients.reviewer.post(`/api/reports/${r.id}/comments`, { body: 'd0 late side: confirm on the bench', target: { kind: 'bit', channelId: 'telemetry', index: 1 } })
    expect(comment.status, JSON.stringify(comment.data)).toBe(201)
    expect((await w.clients.reviewer.post(`/api/reports/${r.id}/comments`, { body: 'x', target: { kind: 'bit', channelId: 'telemetry', index: 40 } })).status).toBe(400)
    expect((await w.clients.reviewer.post(`/api/reports/${r.id}/comments`, { body: 'x', target: { kind: 'check', id: 'miso-setup' } })).status).toBe(400)
    expect((await w.clients.viewer.post(`/api/reports/${r.id}/comments`, { body: 'x' })).status).toBe(403)

    const off = await w.clients.reviewer.post(`/api/reports/${r.id}/sign-off`, {})
    expect(off.status, JSON.stringify(off.data)).toBe(200)
    expect(off.data).toMatchObject({ state: 'signed-off', decidedBy: { id: w.users.reviewer.id } })
    expect(off.data.comments.map((c: { body: string }) => c.body)).toContain('d0 late side: confirm on the bench')
    const toAuthor = await waitForMail(w.users.engineer.email, { subject: `signed off: Gate-driver telemetry UART ${r.label}` })
    expect(toAuthor.text).toContain('Test reviewer signed off')

    const actions = (await AuditEntry.findAll({ where: { entity: 'report', entityId: r.id }, order: [['id', 'ASC']] })).map((a) => a.action)
    expect(actions).toEqual(['report.freeze', 'report.submit', 'report.comment', 'report.sign-off'])
    // a decided revision is not decided again
    expect((await w.clients.admin.post(`/api/reports/${r.id}/return`, { comment: 'late' })).status).toBe(409)
  })

  it('return with a comment mails the author; the next revision starts as a draft', async () => {
    const r = await freeze()
    await w.clients.engineer.post(`/api/reports/${r.id}/submit`, { reviewerId: w.users.admin.id })
    expect((await w.clients.admin.post(`/api/reports/${r.id}/return`, {})).status).toBe(400)
    const ret = await w.clients.admin.post(`/api/reports/${r.id}/return`, { comment: 'Use the smaller pull-up from the sweep.' })
    expect(ret.status).toBe(200)
    expect(ret.data).toMatchObject({ state: 'returned', decisionNote: 'Use the smaller pull-up from the sweep.' })
    const mail = await waitForMail(w.users.engineer.email, { subject: `returned: Gate-driver telemetry UART ${r.label}` })
    expect(mail.text).toContain('Use the smaller pull-up from the sweep.')
    expect((await w.clients.engineer.post(`/api/reports/${r.id}/submit`, { reviewerId: w.users.admin.id })).status).toBe(409)
    const next = await freeze()
    expect(next).toMatchObject({ state: 'draft', number: r.number + 1 })
  })

  it('refusals: own revision, viewer, engineer deciding, other team, reviewer not in the team', async () => {
    const mine = await freeze(telemetryId, w.clients.admin)
    // the author cannot be the reviewer, and cannot sign off their own revision
    expect((await w.clients.admin.post(`/api/reports/${mine.id}/submit`, { reviewerId: w.users.admin.id })).status).toBe(400)
    expect((await w.clients.admin.post(`/api/reports/${mine.id}/submit`, { reviewerId: w.users.outsider.id })).status).toBe(400)
    expect((await w.clients.admin.post(`/api/reports/${mine.id}/submit`, { reviewerId: w.users.engineer.id })).status).toBe(400)
    expect((await w.clients.viewer.post(`/api/reports/${mine.id}/submit`, { reviewerId: w.users.reviewer.id })).status).toBe(403)
    expect((await w.clients.admin.post(`/api/reports/${mine.id}/submit`, { reviewerId: w.users.reviewer.id })).status).toBe(200)
    const self = await w.clients.admin.post(`/api/reports/${mine.id}/sign-off`, {})
    expect(self.status).toBe(403)
    expect(self.data.message ?? self.data.statusMessage).toMatch(/own revision/)
    expect((await w.clients.viewer.post(`/api/reports/${mine.id}/sign-off`, {})).status).toBe(403)
    expect((await w.clients.engineer.post(`/api/reports/${mine.id}/sign-off`, {})).status).toBe(403)
    expect((await w.clients.outsider.post(`/api/reports/${mine.id}/sign-off`, {})).status).toBe(404)
    expect((await w.clients.outsider.get(`/api/reports/${mine.id}`)).status).toBe(404)
    expect((await w.clients.outsider.get(`/reports/${mine.id}/report.pdf`)).status).toBe(404)
    expect((await w.clients.signedOut.get(`/api/reports/${mine.id}`)).status).toBe(401)
    expect((await w.clients.viewer.get(`/api/reports/${mine.id}`)).status).toBe(200)
    expect((await w.clients.reviewer.post(`/api/reports/${mine.id}/sign-off`, {})).status).toBe(200)
  })

  it('two reviewers deciding at once: one wins, the other gets 409', async () => {
    const r = await freeze()
    await w.clients.engineer.post(`/api/reports/${r.id}/submit`, { reviewerId: w.users.reviewer.id })
    const before = (await mailsTo(w.users.engineer.email)).length
    const [a, b] = await Promise.all([
      w.clients.reviewer.post(`/api/reports/${r.id}/sign-off`, {}),
      w.clients.admin.post(`/api/reports/${r.id}/return`, { comment: 'not yet' }),
    ])
    expect([a.status, b.status].sort()).toEqual([200, 409])
    const final = await w.clients.viewer.get(`/api/reports/${r.id}`)
    expect(final.data.state).toBe(a.status === 200 ? 'signed-off' : 'returned')
    expect(final.data.events.filter((e: { action: string }) => e.action === 'sign-off' || e.action === 'return')).toHaveLength(1)
    await waitForMail(w.users.engineer.email, { subject: r.label })
    expect((await mailsTo(w.users.engineer.email)).length).toBe(before + 1)
    // a stale version is a conflict as well
    const r2 = await freeze()
    expect((await w.clients.engineer.post(`/api/reports/${r2.id}/submit`, { reviewerId: w.users.reviewer.id, version: r2.version + 1 })).status).toBe(409)
  })
})

describe('recompute, exports and import', () => {
  it('recompute of a stored revision gives the stored result', async () => {
    const r = await freeze()
    const res = await w.clients.viewer.get(`/api/reports/${r.id}/recompute`)
    expect(res.status).toBe(200)
    expect(res.data).toMatchObject({ same: true, differenceCount: 0, differences: [], storedEngineVersion: r.engineVersion, currentEngineVersion: r.engineVersion })
  })

  it('recompute names what changed when the stored result differs from today’s engine', async () => {
    const r = await freeze()
    useTestDb()
    // simulate a revision frozen by an older engine: rewrite the row below the trigger
    const altered = { ...r.result, verdict: 'pass', uart: { ...r.result.uart, worstMarginUi: 0.25 } }
    const seq = ReportRevision.sequelize!
    await seq.transaction(async (transaction) => {
      await seq.query('ALTER TABLE report_revisions DISABLE TRIGGER report_revisions_frozen', { transaction })
      await seq.query('UPDATE report_revisions SET result = :result WHERE id = :id', { replacements: { result: JSON.stringify(altered), id: r.id }, transaction })
      await seq.query('ALTER TABLE report_revisions ENABLE TRIGGER report_revisions_frozen', { transaction })
    })
    const res = await w.clients.viewer.get(`/api/reports/${r.id}/recompute`)
    expect(res.data.same).toBe(false)
    expect(res.data.verdict).toEqual({ stored: 'pass', recomputed: 'fail' })
    const paths = res.data.differences.map((d: { path: string }) => d.path)
    expect(paths).toEqual(expect.arrayContaining(['verdict', 'uart.worstMarginUi']))
    expect(res.data.differences.find((d: { path: string }) => d.path === 'uart.worstMarginUi')).toEqual({ path: 'uart.worstMarginUi', stored: 0.25, recomputed: r.result.uart.worstMarginUi })
  })

  it('the PDF opens and holds the report; every member gets the same bytes', async () => {
    const r = await freeze()
    await w.clients.engineer.post(`/api/reports/${r.id}/submit`, { reviewerId: w.users.reviewer.id })
    await w.clients.reviewer.post(`/api/reports/${r.id}/comments`, { body: 'Stop bit margin is healthy.', target: { kind: 'bit', channelId: 'telemetry', index: 9 } })
    await w.clients.reviewer.post(`/api/reports/${r.id}/sign-off`, {})
    const a = await fetchBytes(w.users.engineer.email, `/reports/${r.id}/report.pdf`)
    expect(a.status).toBe(200)
    expect(a.headers.get('content-type')).toBe('application/pdf')
    expect(a.headers.get('content-disposition')).toMatch(/gate-driver-telemetry-uart-r\d+\.pdf/)
    const pdfA = a.body
    const pdfB = (await fetchBytes(w.users.reviewer.email, `/reports/${r.id}/report.pdf`)).body
    expect(pdfA.subarray(0, 5).toString()).toBe('%PDF-')
    // the document depends on the revision only, not on who downloads it (pdfkit's ID aside)
    const strip = (b: Buffer) => b.toString('latin1').replace(/\/ID \[<[0-9a-f]+> <[0-9a-f]+>\]/, '')
    expect(strip(pdfA)).toBe(strip(pdfB))
    const file = path.join(dir, 'report.pdf')
    writeFileSync(file, pdfA)
    const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
    expect(text).toContain('Gate-driver telemetry UART')
    expect(text).toContain(`revision ${r.label} · signed off`)
    expect(text).toContain(formatUi(r.result.uart.worstMarginUi))
    expect(text).toContain('Test reviewer')
    expect(text).toContain('Stop bit margin is healthy.')
    expect(text).toContain('Safety caution')
    const letter = (await fetchBytes(w.users.viewer.email, `/reports/${r.id}/report.pdf?paper=letter`)).body
    writeFileSync(path.join(dir, 'letter.pdf'), letter)
    expect(execFileSync('pdfinfo', [path.join(dir, 'letter.pdf')], { encoding: 'utf8' })).toMatch(/\(letter\)/)
    expect((await w.clients.viewer.get(`/reports/${r.id}/report.pdf?paper=a3`)).status).toBe(400)
  })

  it('CSV of the tables carries the engine numbers', async () => {
    const r = await freeze()
    const res = await w.clients.viewer.request('GET', `/reports/${r.id}/tables.csv?table=bits`, undefined, { accept: 'text/csv' })
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toMatch(/text\/csv/)
    const lines = String(res.data).trim().split('\r\n')
    expect(lines[0]).toMatch(/^channel,bit,label,early margin \(s\)/)
    expect(lines).toHaveLength(1 + r.result.uart.bits.length)
    const d0 = lines[2]!.split(',')
    expect(Number(d0[6])).toBe(r.result.uart.bits[1].marginUi)
    expect((await w.clients.viewer.request('GET', `/reports/${r.id}/tables.csv?table=checks`)).status).toBe(404)
    expect((await w.clients.viewer.request('GET', `/reports/${r.id}/tables.csv?table=nope`)).status).toBe(400)
    const spi = await freeze(spiLinkId)
    const checks = await w.clients.viewer.request('GET', `/reports/${spi.id}/tables.csv?table=checks`)
    expect(String(checks.data).trim().split('\r\n')).toHaveLength(1 + spi.result.spi.checks.length)
  })

  it('a downloaded link JSON re-imports to the same analysis; bad files name each problem', async () => {
    const r = await freeze(spiLinkId)
    const dl = await w.clients.viewer.request('GET', `/reports/${r.id}/link.json`)
    expect(dl.status).toBe(200)
    const json = typeof dl.data === 'string' ? JSON.parse(dl.data) : dl.data
    expect(json.schemaVersion).toBe(2)
    const current = await w.clients.viewer.request('GET', `/links/${spiLinkId}/link.json`)
    expect(current.status).toBe(200)

    const imported = await w.clients.engineer.post(`/api/projects/${projectId}/links/import`, json)
    expect(imported.status, JSON.stringify(imported.data)).toBe(201)
    const analysis = await w.clients.viewer.get(`/api/links/${imported.data.id}/analysis`)
    expect(analysis.data).toEqual(r.result)

    const bad = structuredClone(json)
    bad.schemaVersion = 7
    bad.channels[0].receiver.vih = 'high'
    delete bad.spi.sclkHz
    const refused = await w.clients.engineer.post(`/api/projects/${projectId}/links/import`, bad)
    expect(refused.status).toBe(400)
    const paths = refused.data.data.issues.map((i: { path: (string | number)[] }) => i.path.join('.'))
    expect(paths).toEqual(expect.arrayContaining(['schemaVersion', 'channels.0.receiver.vih', 'spi.sclkHz']))
    expect((await w.clients.viewer.post(`/api/projects/${projectId}/links/import`, json)).status).toBe(403)
    expect((await w.clients.outsider.post(`/api/projects/${projectId}/links/import`, json)).status).toBe(404)
  })

  it('the project page lists each link’s latest revision and its state', async () => {
    const res = await w.clients.viewer.get(`/api/projects/${projectId}/reports/latest`)
    expect(res.status).toBe(200)
    const all = (await w.clients.viewer.get(`/api/links/${telemetryId}/reports`)).data
    const newest = all[0]
    expect(res.data.find((l: { linkId: number }) => l.linkId === telemetryId)).toMatchObject({ reportId: newest.id, label: newest.label, state: newest.state })
    expect((await w.clients.outsider.get(`/api/projects/${projectId}/reports/latest`)).status).toBe(404)
  })
})

describe('captures that back a revision', () => {
  /** A session cookie for multipart uploads (the api client sends JSON). */
  async function cookieOf(email: string) {
    const signIn = await fetch(`${inject('baseURL')}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: FACTORY_PASSWORD }) })
    expect(signIn.status).toBe(200)
    return signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ')
  }
  async function upload(linkId: number, text: string, name: string, fields: Record<string, string> = {}) {
    const form = new FormData()
    for (const [k, v] of Object.entries(fields)) form.set(k, v)
    form.set('file', new Blob([text], { type: 'text/csv' }), name)
    const res = await fetch(`${inject('baseURL')}/api/links/${linkId}/captures`, { method: 'POST', body: form, headers: { cookie: await cookieOf(w.users.engineer.email) } })
    const data = await res.json()
    expect(res.status, JSON.stringify(data)).toBe(202)
    return data as { id: number; sha256: string; size: number }
  }
  async function settled(id: number) {
    const end = Date.now() + 30_000
    for (;;) {
      const res = await w.clients.viewer.get(`/api/captures/${id}`)
      if (res.data.status === 'done' || res.data.status === 'failed' || Date.now() > end) return res.data
      await new Promise((r) => setTimeout(r, 250))
    }
  }

  it('a freeze records the done captures with their measured numbers; deleting a capture leaves the revision as it was', async () => {
    const linkId = (await buildLink(w.clients.engineer, projectId, buildLinkSpec('telemetry', 'Captured telemetry'))).id
    const none = await freeze(linkId)
    expect(none.captures).toEqual([])

    const { text, edges } = couplerCapture()
    const up = await upload(linkId, text, 'bench 0412.csv', { label: 'coupler at 4.7k', rl: '4700' })
    // a capture whose extraction fails (a malformed line past the part checked at upload) backs nothing
    const lines = text.split('\n')
    lines[60_000] = 'not,a,number'
    const bad = await upload(linkId, lines.join('\n'), 'broken.csv')
    const capture = await settled(up.id)
    expect(capture.status, JSON.stringify(capture.error)).toBe('done')
    expect((await settled(bad.id)).status).toBe('failed')

    // the measured point applied to the coupler stage, saved through the ordinary PATCH
    const link = await w.clients.engineer.get(`/api/links/${linkId}`)
    const { spec } = applyCaptureToStage(link.data.spec, { channel: 0, stage: 0 }, capture.result, 'characterization', { rl: 4700 })
    expect((await w.clients.engineer.patch(`/api/links/${linkId}`, { version: link.data.version, spec })).status).toBe(200)

    const r = await freeze(linkId)
    expect(r.captures).toHaveLength(1)
    const c = r.captures[0]
    const p = capture.result.pairing
    expect(c).toMatchObject({
      id: up.id,
      label: 'coupler at 4.7k',
      fileName: 'bench 0412.csv',
      sha256: up.sha256,
      size: up.size,
      uploadedBy: { id: w.users.engineer.id, name: 'Test engineer' },
      uploadedAt: capture.createdAt,
      input: { number: 1, name: 'TX pin (V)' },
      output: { number: 2, name: 'Coupler out (V)', tr: capture.result.channels[1].tr, tf: capture.result.channels[1].tf },
      inverting: true,
      rl: 4700,
      available: true,
      appliedTo: { channelId: spec.channels[0]!.id, stageIndex: 0, as: 'characterization' },
    })
    expect(c.tPLH).toEqual(p.tPLH)
    expect(c.tPHL).toEqual(p.tPHL)
    expect(c.tPLH.count + c.tPHL.count).toBe(edges)
    expect(Math.abs(c.tPLH.mean - 22e-6)).toBeLessThan(0.1e-6)
    expect(Math.abs(c.tPHL.mean - 3e-6)).toBeLessThan(0.1e-6)
    // the earlier revision, frozen before the upload, stays without captures
    expect((await w.clients.viewer.get(`/api/reports/${none.id}`)).data.captures).toEqual([])

    // the column is frozen: the trigger refuses an UPDATE of it, by SQL or through the model
    const db = useTestDb()
    await expect(db.query(`UPDATE report_revisions SET captures = '[]'::jsonb WHERE id = :id`, { replacements: { id: r.id } })).rejects.toThrow(/immutable/)
    await expect(ReportRevision.update({ captures: [] }, { where: { id: r.id } })).rejects.toThrow(/immutable/)
    const [row] = await db.query<{ captures: { id: number }[] }>('SELECT captures FROM report_revisions WHERE id = :id', { replacements: { id: r.id }, type: QueryTypes.SELECT })
    expect(row!.captures.map((x) => x.id)).toEqual([up.id])

    const pdf = await fetchBytes(w.users.viewer.email, `/reports/${r.id}/report.pdf`)
    expect(pdf.status).toBe(200)
    const file = path.join(dir, 'captures.pdf')
    writeFileSync(file, pdf.body)
    const pdfTextOut = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
    expect(pdfTextOut).toContain('Captures that back this revision')
    expect(pdfTextOut).toContain(`Capture ${up.id}: coupler at 4.7k`)
    expect(pdfTextOut).toContain(pdfText(formatEng(c.tPLH.mean, 's', { digits: 4 })))
    expect(pdfTextOut).toContain(pdfText(formatEng(c.tPHL.mean, 's', { digits: 4 })))

    expect((await w.clients.engineer.delete(`/api/captures/${up.id}`)).status).toBe(204)
    expect((await w.clients.viewer.get(`/api/captures/${up.id}`)).status).toBe(404)
    const after = await w.clients.viewer.get(`/api/reports/${r.id}`)
    expect(after.status).toBe(200)
    expect(after.data.captures).toEqual([{ ...c, available: false }])
    writeFileSync(file, (await fetchBytes(w.users.viewer.email, `/reports/${r.id}/report.pdf`)).body)
    const afterPdf = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
    expect(afterPdf.replace(/\s+/g, ' ')).toContain('since deleted')
    expect(afterPdf).toContain(pdfText(formatEng(c.tPLH.mean, 's', { digits: 4 })))
    // the review state still moves on a revision with captures
    const sub = await w.clients.engineer.post(`/api/reports/${r.id}/submit`, { reviewerId: w.users.reviewer.id })
    expect(sub.status, JSON.stringify(sub.data)).toBe(200)
    expect(sub.data.captures).toEqual(after.data.captures)
  })
})

/** A binary download as the user's browser gets it (the api client reads text only). */
async function fetchBytes(email: string, p: string) {
  const base = inject('baseURL')
  const signIn = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: FACTORY_PASSWORD }) })
  expect(signIn.status).toBe(200)
  const cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ')
  const res = await fetch(`${base}${p}`, { headers: { cookie } })
  return { status: res.status, headers: res.headers, body: Buffer.from(await res.arrayBuffer()) }
}
