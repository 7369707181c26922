/**
 * Extra server processes for the scale-out, cluster and overload tests: the built app on a
 * port of its own (one process, or the cluster launcher scripts/serve.ts), and HAProxy from
 * Debian's package in front of several of them, all on loopback. Each shares the suite's
 * PostgreSQL and S3 fake (their settings are in process.env, set by the global setup).
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'

const output = process.env.BITSLACK_OUTPUT_DIR || '.output'
const entry = `${output}/server/index.mjs`
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))

/** A port of this test slot: the suite's port plus an offset that no other test file uses. */
export function slotPort(offset: number): number {
  return Number(process.env.BITSLACK_TEST_PORT || 3100) + offset
}

export interface Running {
  url: string
  child: ChildProcess
  /** SIGTERM, then wait for the exit (SIGKILL after 20 s) */
  stop(): Promise<void>
}

async function until(url: string, child: ChildProcess, what: string, ms = 60_000): Promise<void> {
  const deadline = Date.now() + ms
  for (;;) {
    if (child.exitCode !== null) throw new Error(`${what} exited with ${child.exitCode}`)
    try {
      if ((await fetch(url)).ok) return
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error(`${what} did not answer ${url} within ${ms / 1000} s`)
    await sleep(200)
  }
}

function stopper(child: ChildProcess): () => Promise<void> {
  return async () => {
    if (child.exitCode !== null || child.signalCode !== null) return
    const exited = new Promise((r) => child.once('exit', r))
    child.kill('SIGTERM')
    const timer = setTimeout(() => child.kill('SIGKILL'), 20_000)
    await exited
    clearTimeout(timer)
  }
}

/** The built app on `port`; `workers` > 0 runs it through the cluster launcher with that many workers. */
export async function startApp(port: number, env: Record<string, string> = {}, workers = 0): Promise<Running> {
  const args = workers > 0 ? ['--import', 'tsx', 'scripts/serve.ts', entry] : [entry]
  const child = spawn(process.execPath, args, {
    env: {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      NODE_ENV: 'production',
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: '9',
      BITSLACK_TRUST_PROXY: '1',
      ...(workers > 0 ? { BITSLACK_WORKERS: String(workers) } : {}),
      ...env,
    },
    stdio: ['ignore', 'pipe', 'inherit'],
  })
  const lines: string[] = []
  child.stdout!.on('data', (b: Buffer) => lines.push(...b.toString().split('\n').filter(Boolean)))
  const url = `http://127.0.0.1:${port}`
  await until(`${url}/api/health`, child, `the app on ${port}`)
  return Object.assign({ url, child, stop: stopper(child) }, { log: lines })
}

/**
 * HAProxy on `port` balancing round-robin over the backends, with health checks on
 * /api/health, retries on another backend when one is gone, X-Forwarded-For appended, and
 * the answering backend named in X-Served-By (for the tests to see the balancing).
 */
export async function startHaproxy(port: number, backends: { name: string; port: number }[]): Promise<Running> {
  const dir = mkdtempSync(path.join(tmpdir(), 'bitslack-haproxy-'))
  const cfg = path.join(dir, 'haproxy.cfg')
  writeFileSync(
    cfg,
    [
      'global',
      '  maxconn 4000',
      'defaults',
      '  mode http',
      '  timeout connect 2s',
      '  timeout client 60s',
      '  timeout server 60s',
      '  option forwardfor',
      '  retries 2',
      '  option redispatch',
      '  retry-on conn-failure',
      'frontend web',
      `  bind 127.0.0.1:${port}`,
      '  default_backend app',
      'backend app',
      '  balance roundrobin',
      '  option httpchk GET /api/health',
      '  http-check expect status 200',
      '  http-response set-header X-Served-By %s',
      ...backends.map((b) => `  server ${b.name} 127.0.0.1:${b.port} check inter 1s fall 2 rise 1`),
      '',
    ].join('\n'),
  )
  const child = spawn('/usr/sbin/haproxy', ['-f', cfg, '-db'], { stdio: ['ignore', 'ignore', 'inherit'] })
  const url = `http://127.0.0.1:${port}`
  await until(`${url}/api/health`, child, 'haproxy')
  return { url, child, stop: stopper(child) }
}
