/**
 * Serve the built app on every core: a node:cluster primary forks one worker per core
 * (BITSLACK_WORKERS to choose), each running the built Nitro server; the workers share the
 * listening port (the primary hands connections round-robin). A worker that dies is
 * replaced (with a growing pause if it keeps dying at start). SIGHUP restarts the workers
 * one at a time: a new one listens first, then the old one drains (it stops taking
 * connections and closes each open one after its next answer, server/plugins/drain.ts),
 * disconnects and stops, so no request is refused or cut; SIGTERM / SIGINT stop them
 * gracefully (Nitro finishes the requests in flight).
 *
 *   tsx scripts/serve.ts [path/to/server/index.mjs]
 */
import cluster, { type Worker } from 'node:cluster'
import { availableParallelism } from 'node:os'
import path from 'node:path'

const entry = path.resolve(process.argv[2] ?? process.env.BITSLACK_SERVER_ENTRY ?? '.output/server/index.mjs')
const requested = Number(process.env.BITSLACK_WORKERS)
const count = Number.isInteger(requested) && requested > 0 ? requested : availableParallelism()
const log = (m: string) => console.log(`[bitslack] ${m}`)

// the workers run plain node on the built server (no TypeScript loader), each told how many
// siblings it has, so it sizes its database pool for its share (server/utils/settings.ts)
cluster.setupPrimary({ exec: entry, execArgv: [] })
const env = { BITSLACK_WORKERS: String(count) }

let stopping = false
const quickDeaths: number[] = []

function fork(): Worker {
  const w = cluster.fork(env)
  ;(w as Worker & { startedAt?: number }).startedAt = Date.now()
  return w
}

function listening(w: Worker): Promise<void> {
  return new Promise((resolve, reject) => {
    w.once('listening', () => resolve())
    w.once('exit', (code) => reject(new Error(`worker ${w.process.pid} exited with ${code} before listening`)))
  })
}

/** Let a worker finish its open connections and leave the shared port before it is stopped. */
function drain(w: Worker, timeoutMs = 10_000): Promise<void> {
  return new Promise((resolve) => {
    const finish = () => {
      clearTimeout(timer)
      w.off('message', onMessage)
      resolve()
    }
    const onMessage = (m: unknown) => m === 'bitslack:drained' && finish()
    const timer = setTimeout(finish, timeoutMs)
    w.on('message', onMessage)
    w.once('exit', finish)
    w.send('bitslack:drain')
  }).then(
    () =>
      new Promise<void>((resolve) => {
        if (w.isDead() || !w.isConnected()) return resolve()
        const timer = setTimeout(resolve, 5_000)
        w.once('disconnect', () => {
          clearTimeout(timer)
          resolve()
        })
        w.disconnect()
      }),
  )
}

function stop(w: Worker, timeoutMs = 35_000): Promise<void> {
  return new Promise((resolve) => {
    if (w.isDead()) return resolve()
    const timer = setTimeout(() => w.process.kill('SIGKILL'), timeoutMs)
    w.once('exit', () => {
      clearTimeout(timer)
      resolve()
    })
    w.process.kill('SIGTERM')
  })
}

cluster.on('exit', (w: Worker & { startedAt?: number; replaced?: boolean }, code, signal) => {
  if (stopping || w.replaced) return
  log(`worker ${w.process.pid} ended (${signal ?? code}); starting another`)
  const now = Date.now()
  if (now - (w.startedAt ?? 0) < 10_000) quickDeaths.push(now)
  while (quickDeaths.length && now - quickDeaths[0]! > 60_000) quickDeaths.shift()
  // a worker that keeps dying at start (a bad setting, a missing database) is not forked in a tight loop
  const pause = Math.min(30_000, 2 ** Math.max(0, quickDeaths.length - 1) * 250)
  setTimeout(() => !stopping && fork(), quickDeaths.length ? pause : 0)
})

async function rollingRestart() {
  log('restarting the workers one at a time')
  for (const old of Object.values(cluster.workers ?? {})) {
    if (!old || old.isDead()) continue
    const fresh = fork()
    try {
      await listening(fresh)
    } catch (err) {
      log(`restart stopped: ${(err as Error).message}; the running workers stay`)
      return
    }
    ;(old as Worker & { replaced?: boolean }).replaced = true
    await drain(old)
    await stop(old)
  }
  log('restart done')
}

async function shutdown(signal: string) {
  if (stopping) return
  stopping = true
  log(`${signal}: stopping ${Object.keys(cluster.workers ?? {}).length} workers`)
  await Promise.all(Object.values(cluster.workers ?? {}).map((w) => w && stop(w)))
  process.exit(0)
}

process.on('SIGHUP', () => void rollingRestart())
process.on('SIGTERM', () => void shutdown('SIGTERM'))
process.on('SIGINT', () => void shutdown('SIGINT'))

log(`serving with ${count} worker${count === 1 ? '' : 's'} (${entry})`)
for (let i = 0; i < count; i++) fork()
