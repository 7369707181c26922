/**
 * The web-tier bench run by scripts/bench-web.sh (npm run bench:web), against the built
 * production server with the demo seeded. One run prints:
 *   1. analyze route: server time per request (one worker, saturated: 1 / throughput) over
 *      the engine's own time for the same link in-process (goal <= 3x);
 *   2. link page SSR throughput over the sign-in page's (goal >= 0.5x);
 *   3. bytes of the link page and the calls it makes in the browser, on a link with 100
 *      large captures (goal: page under 200 kB), beside the same link without captures;
 *   4. throughput with every worker over one worker (goal >= 1.7x on 2 cores);
 *   5. the same through two processes behind HAProxy;
 *   and every error. Figures are printed, never asserted.
 * Servers (started by the shell script): ONE_URL one worker, ALL_URL the cluster, PROXY_URL
 * the proxy over two processes.
 */
import autocannon from 'autocannon'
import { createSequelize } from '../server/db/sequelize'
import { Capture, initModels, Link } from '../server/db/models'
import { TELEMETRY_LINK } from '../server/db/seeders/demo-links'
import { analyzeLink } from '../server/timing'
import { summariseCaptureResult } from '../shared/utils/capture-summary'
import { largeExtraction, storedCaptures } from '../tests/factories/captures'

const one = process.env.ONE_URL!
const all = process.env.ALL_URL!
const proxy = process.env.PROXY_URL!
const seconds = Number(process.env.BENCH_SECONDS || 8)
const connections = Number(process.env.BENCH_CONNECTIONS || 20)
let errors = 0

async function signIn(url: string) {
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'firmware@harrowbay.example', password: 'harrow-bay-demo' }),
  })
  if (!res.ok) throw new Error(`sign-in at ${url}: ${res.status}`)
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ')
}

async function run(name: string, url: string, req: { method?: 'GET' | 'POST'; path: string; body?: string; cookie?: string }) {
  const r = await autocannon({
    url,
    connections,
    duration: seconds,
    requests: [{ method: req.method ?? 'GET', path: req.path, body: req.body, headers: { 'content-type': 'application/json', ...(req.cookie ? { cookie: req.cookie } : {}) } }],
  })
  const bad = r.errors + r.timeouts + r.non2xx
  errors += bad
  const codes = Object.entries(r.statusCodeStats as Record<string, { count: number }>).filter(([c]) => c !== '200').map(([c, v]) => `${v.count} x ${c}`)
  console.log(`  ${name}: ${r.requests.average.toFixed(0)} req/s, p50 ${r.latency.p50} ms, p99 ${r.latency.p99} ms, errors ${bad}${codes.length ? ` (${codes.join(', ')})` : ''}`)
  await settle(url)
  return r.requests.average
}

/** Let the requests the load left queued finish before the next phase (or measurement) starts. */
async function settle(url: string) {
  for (let i = 0; i < 100; i++) {
    const t0 = performance.now()
    const ok = (await fetch(`${url}/api/health`).catch(() => null))?.ok
    if (ok && performance.now() - t0 < 20) break
    await new Promise((r) => setTimeout(r, 200))
  }
  await new Promise((r) => setTimeout(r, 1000))
}

/** The engine's time per analysis of the link, in-process (mean of a timed loop after warm-up). */
function engineMs(): number {
  for (let i = 0; i < 200; i++) analyzeLink(structuredClone(TELEMETRY_LINK))
  const n = 2000
  const t0 = performance.now()
  for (let i = 0; i < n; i++) analyzeLink(structuredClone(TELEMETRY_LINK))
  return (performance.now() - t0) / n
}

/** A link of its own with 100 large captures (a real extraction of a long capture, stored 100 times). */
async function crowdedLink(): Promise<{ crowded: number; plain: number }> {
  const sequelize = createSequelize()
  initModels(sequelize)
  try {
    const demo = await Link.findOne({ where: { name: TELEMETRY_LINK.name }, rejectOnEmpty: true })
    const copy = (name: string) => Link.create({ ...demo.get({ plain: true }), id: undefined, name, version: 1 } as never)
    const [crowded, plain] = [await copy('Bench link, 100 captures'), await copy('Bench link, no capture')]
    const { result, waveform } = await largeExtraction()
    await Capture.bulkCreate(storedCaptures({ linkId: crowded.id, teamId: crowded.teamId, ownerId: null, count: 100, keyPrefix: 'captures/bench' }, { result, waveform }))
    console.log(`  seeded: each capture's full result ${(JSON.stringify(result).length / 1024).toFixed(0)} kB, its summary ${(JSON.stringify(summariseCaptureResult(result)).length / 1024).toFixed(1)} kB`)
    return { crowded: crowded.id, plain: plain.id }
  } finally {
    await sequelize.close()
  }
}

async function bytes(url: string, path: string, cookie: string): Promise<number> {
  const res = await fetch(url + path, { headers: { cookie, accept: path.startsWith('/api/') ? 'application/json' : 'text/html' } })
  const body = await res.arrayBuffer()
  if (!res.ok) {
    errors++
    console.log(`  ${path}: ${res.status}`)
  }
  return body.byteLength
}

const kB = (n: number) => `${(n / 1024).toFixed(1)} kB`

const cookie = await signIn(one)
console.log(`bench:web: ${connections} connections, ${seconds} s per phase`)

console.log('1. analyze route against the engine (one worker)')
const engine = engineMs()
const analyzeBody = JSON.stringify(TELEMETRY_LINK)
const analyzeRate = await run('POST /api/analyze, one worker', one, { method: 'POST', path: '/api/analyze', body: analyzeBody, cookie })
const serverMs = 1000 / analyzeRate
const analyzeBytes = (await (await fetch(`${one}/api/analyze`, { method: 'POST', body: analyzeBody, headers: { cookie, 'content-type': 'application/json' } })).arrayBuffer()).byteLength
console.log(`  engine ${engine.toFixed(3)} ms per analysis in-process; server ${serverMs.toFixed(3)} ms per request -> ${(serverMs / engine).toFixed(1)}x (goal <= 3x); response ${kB(analyzeBytes)}`)

console.log('2. link page against the sign-in page (one worker)')
const { crowded, plain } = await crowdedLink()
const pageRate = await run(`GET /links/${plain}`, one, { path: `/links/${plain}`, cookie })
const signInRate = await run('GET /sign-in', one, { path: '/sign-in' })
console.log(`  link page / sign-in page: ${(pageRate / signInRate).toFixed(2)}x (goal >= 0.5x)`)

console.log('3. bytes of the link page with 100 large captures')
const firstPage = (await (await fetch(`${one}/api/links/${crowded}/captures?limit=1`, { headers: { cookie } })).json()) as { id: number }[]
const selected = firstPage[0]!.id
const sizes = {
  page: await bytes(one, `/links/${crowded}`, cookie),
  pageWithout: await bytes(one, `/links/${plain}`, cookie),
  captures: await bytes(one, `/api/links/${crowded}/captures`, cookie),
  detail: await bytes(one, `/api/captures/${selected}`, cookie),
  waveform: await bytes(one, `/api/captures/${selected}/waveform?width=1200`, cookie),
}
console.log(`  /links/${crowded} (100 captures): ${kB(sizes.page)} (goal < 200 kB); the same link without captures ${kB(sizes.pageWithout)}`)
console.log(`  in the browser: capture list page ${kB(sizes.captures)}, the selected capture ${kB(sizes.detail)}, its waveform ${kB(sizes.waveform)}`)
const crowdedRate = await run(`GET /links/${crowded} (100 captures)`, one, { path: `/links/${crowded}`, cookie })
console.log(`  with 100 captures / without: ${(crowdedRate / pageRate).toFixed(2)}x`)

console.log('4. every worker against one worker')
const allCookie = await signIn(all)
const allAnalyze = await run('POST /api/analyze, every worker', all, { method: 'POST', path: '/api/analyze', body: analyzeBody, cookie: allCookie })
const allPage = await run(`GET /links/${plain}, every worker`, all, { path: `/links/${plain}`, cookie: allCookie })
console.log(`  analyze ${(allAnalyze / analyzeRate).toFixed(2)}x, link page ${(allPage / pageRate).toFixed(2)}x (goal >= 1.7x on 2 cores; the load generator shares the cores)`)

console.log('5. two processes behind HAProxy')
const proxyCookie = await signIn(proxy)
const proxyAnalyze = await run('POST /api/analyze through the proxy', proxy, { method: 'POST', path: '/api/analyze', body: analyzeBody, cookie: proxyCookie })
const proxyPage = await run(`GET /links/${plain} through the proxy`, proxy, { path: `/links/${plain}`, cookie: proxyCookie })
console.log(`  against one worker: analyze ${(proxyAnalyze / analyzeRate).toFixed(2)}x, link page ${(proxyPage / pageRate).toFixed(2)}x`)

console.log(`errors: ${errors}`)
