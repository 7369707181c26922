/**
 * Faults: a capture whose row was committed but whose job was never sent (the process
 * died in between) is not lost: an app instance that starts afterwards queues it again
 * at boot and some instance extracts it. Instances share one queue in PostgreSQL.
 */
import { randomUUID } from 'node:crypto'
import { spawn, type ChildProcess } from 'node:child_process'
import { afterAll, describe, expect, inject, it } from 'vitest'
import { PutObjectCommand, S3Client } from '@aws-sdk/client-s3'
import { QueryTypes } from 'sequelize'
import { buildWorld } from '../../factories/world'
import { buildLink, buildLinkSpec, buildProject } from '../../factories/workspace'
import { useTestDb } from '../../factories/db'
import { delayedEdges, nrzEdges, sampleWave, toCsv } from '../../factories/captures'

const storage = inject('storage')
const output = process.env.BITSLACK_OUTPUT_DIR || '.output'
const sparePort = Number(process.env.BITSLACK_TEST_PORT || 3100) + 8
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))
let spare: ChildProcess | undefined

afterAll(async () => {
  if (spare && spare.exitCode === null) {
    spare.kill('SIGTERM')
    await new Promise((r) => spare!.once('exit', r))
  }
})

describe('capture jobs survive a crash between commit and send', () => {
  it('an instance starting afterwards finds the stranded capture and it gets extracted', async () => {
    const world = await buildWorld()
    const project = await buildProject(world.clients.engineer, world.teamId)
    const link = await buildLink(world.clients.engineer, project.id, buildLinkSpec('telemetry'))
    // the state a crash leaves: the object stored, the row committed as queued, no job
    const bit = 1 / 9600
    const input = nrzEdges(20, bit, 20e-6, 31)
    const dt = 200e-9
    const n = Math.ceil((20 * bit + 100e-6) / dt)
    const vin = sampleWave(n, 0, dt, { edges: input, low: 0, high: 3.3, rise: { kind: 'ramp', duration: 20e-9 }, fall: { kind: 'ramp', duration: 20e-9 } })
    const vout = sampleWave(n, 0, dt, { edges: delayedEdges(input, { tPLH: 22e-6, tPHL: 3e-6, inverting: true }), low: 0.2, high: 3.3, rise: { kind: 'exp', tau: 6.8e-6 }, fall: { kind: 'ramp', duration: 2e-6 } })
    const bytes = Buffer.from(toCsv(0, dt, [vin, vout]))
    const key = `captures/${world.teamId}/${randomUUID()}`
    const s3 = new S3Client({ endpoint: storage.S3_ENDPOINT, region: storage.S3_REGION, credentials: { accessKeyId: storage.S3_ACCESS_KEY_ID, secretAccessKey: storage.S3_SECRET_ACCESS_KEY }, forcePathStyle: true, requestChecksumCalculation: 'WHEN_REQUIRED', responseChecksumValidation: 'WHEN_REQUIRED' })
    await s3.send(new PutObjectCommand({ Bucket: storage.S3_BUCKET, Key: key, Body: bytes, ContentType: 'text/csv' }))
    const [row] = await useTestDb().query<{ id: number }>(
      `INSERT INTO captures (link_id, team_id, owner_id, label, object_key, file_name, size, content_type, sha256, options, status, progress, created_at, updated_at)
       VALUES (:linkId, :teamId, :ownerId, '', :key, 'stranded.csv', :size, 'text/csv', :sha, '{}', 'queued', 0, now(), now()) RETURNING id`,
      { replacements: { linkId: link.id, teamId: world.teamId, ownerId: world.users.engineer.id, key, size: bytes.length, sha: 'x'.repeat(64) }, type: QueryTypes.SELECT },
    )
    const id = row!.id

    spare = spawn(process.execPath, [`${output}/server/index.mjs`], {
      env: { ...process.env, PORT: String(sparePort), HOST: '127.0.0.1', NODE_ENV: 'production', SMTP_HOST: '127.0.0.1', SMTP_PORT: '9' },
      stdio: 'ignore',
    })
    let status = 'queued'
    let result: { pairing: { tPLH: { mean: number }; tPHL: { mean: number } } } | null = null
    for (let i = 0; i < 100 && status !== 'done' && status !== 'failed'; i++) {
      await sleep(250)
      const [r] = await useTestDb().query<{ status: string; result: typeof result }>('SELECT status, result FROM captures WHERE id = :id', { replacements: { id }, type: QueryTypes.SELECT })
      status = r!.status
      result = r!.result
    }
    expect(spare.exitCode).toBeNull()
    expect(status).toBe('done')
    // common practice: 200 ns samples, no noise: the means within 0.1 us
    expect(Math.abs(result!.pairing.tPLH.mean - 22e-6)).toBeLessThan(0.1e-6)
    expect(Math.abs(result!.pairing.tPHL.mean - 3e-6)).toBeLessThan(0.1e-6)
  })

  it('an extraction whose worker died mid-way is marked retrying and extracted again within a minute (issue 13)', async () => {
    const world = await buildWorld()
    const project = await buildProject(world.clients.engineer, world.teamId)
    const link = await buildLink(world.clients.engineer, project.id, buildLinkSpec('telemetry'))
    const bit = 1 / 9600
    const input = nrzEdges(20, bit, 20e-6, 31)
    const dt = 200e-9
    const n = Math.ceil((20 * bit + 100e-6) / dt)
    const vin = sampleWave(n, 0, dt, { edges: input, low: 0, high: 3.3, rise: { kind: 'ramp', duration: 20e-9 }, fall: { kind: 'ramp', duration: 20e-9 } })
    const vout = sampleWave(n, 0, dt, { edges: delayedEdges(input, { tPLH: 22e-6, tPHL: 3e-6, inverting: true }), low: 0.2, high: 3.3, rise: { kind: 'exp', tau: 6.8e-6 }, fall: { kind: 'ramp', duration: 2e-6 } })
    const bytes = Buffer.from(toCsv(0, dt, [vin, vout]))
    const key = `captures/${world.teamId}/${randomUUID()}`
    const s3 = new S3Client({ endpoint: storage.S3_ENDPOINT, region: storage.S3_REGION, credentials: { accessKeyId: storage.S3_ACCESS_KEY_ID, secretAccessKey: storage.S3_SECRET_ACCESS_KEY }, forcePathStyle: true, requestChecksumCalculation: 'WHEN_REQUIRED', responseChecksumValidation: 'WHEN_REQUIRED' })
    await s3.send(new PutObjectCommand({ Bucket: storage.S3_BUCKET, Key: key, Body: bytes, ContentType: 'text/csv' }))
    // the state a kill -9 leaves: the row "running" at 40 %, its last write two minutes ago
    const [row] = await useTestDb().query<{ id: number }>(
      `INSERT INTO captures (link_id, team_id, owner_id, label, object_key, file_name, size, content_type, sha256, options, status, progress, created_at, updated_at)
       VALUES (:linkId, :teamId, :ownerId, '', :key, 'interrupted.csv', :size, 'text/csv', :sha, '{}', 'running', 0.4, now() - interval '3 minutes', now() - interval '2 minutes') RETURNING id`,
      { replacements: { linkId: link.id, teamId: world.teamId, ownerId: world.users.engineer.id, key, size: bytes.length, sha: 'x'.repeat(64) }, type: QueryTypes.SELECT },
    )
    const started = Date.now()
    let status = 'running'
    for (let i = 0; i < 240 && status !== 'done' && status !== 'failed'; i++) {
      await sleep(250)
      status = (await world.clients.engineer.get(`/api/captures/${row!.id}`)).data.status
    }
    expect(status).toBe('done')
    expect(Date.now() - started).toBeLessThan(60_000)
  }, 90_000)
})
