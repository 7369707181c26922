/**
 * The load mix run by scripts/load.sh (npm run load): signed in as the demo firmware
 * engineer, 50 connections for a bounded time:
 *   phase 1, mixed: 60 % live analysis (POST /api/analyze), 30 % link reads, 10 % saves
 *            (each connection saves its own scratch link, carrying its version forward);
 *   phase 2, analysis only, for the p99 of the analysis route.
 * Prints throughput, p50/p99 and errors of each phase. Goal (not asserted): 0 errors and
 * p99 of analysis <= 25 ms at 50 connections.
 */
import autocannon from 'autocannon'
import { TELEMETRY_LINK } from '../server/db/seeders/demo-links'

const url = process.env.LOAD_URL || 'http://127.0.0.1:3400'
const seconds = Number(process.env.LOAD_SECONDS || 20)
const connections = Number(process.env.LOAD_CONNECTIONS || 50)

async function api(path: string, init: RequestInit & { cookie?: string } = {}) {
  const res = await fetch(url + path, {
    ...init,
    headers: { 'content-type': 'application/json', ...(init.cookie ? { cookie: init.cookie } : {}) },
  })
  if (!res.ok) throw new Error(`${init.method ?? 'GET'} ${path}: ${res.status} ${await res.text()}`)
  return res
}

for (let i = 0; i < 100; i++) {
  try {
    if ((await fetch(`${url}/api/health`)).ok) break
  } catch {
    await new Promise((r) => setTimeout(r, 200))
  }
}

const signIn = await api('/api/auth/sign-in', {
  method: 'POST',
  body: JSON.stringify({ email: 'firmware@harrowbay.example', password: 'harrow-bay-demo' }),
})
const cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ')
const { teams } = (await signIn.json()) as { teams: { id: number }[] }
const projects = (await (await api(`/api/teams/${teams[0]!.id}/projects`, { cookie })).json()) as { id: number }[]
const projectId = projects[0]!.id
const detail = (await (await api(`/api/projects/${projectId}`, { cookie })).json()) as { links: { id: number }[] }
const readIds = detail.links.map((l) => l.id)

// one scratch link per connection for the saves, so no save races another
const scratch: { id: number; version: number }[] = []
for (let i = 0; i < connections; i++) {
  const res = await api(`/api/projects/${projectId}/links`, {
    method: 'POST',
    cookie,
    body: JSON.stringify({ spec: { ...TELEMETRY_LINK, name: `load scratch ${i}` } }),
  })
  const link = (await res.json()) as { id: number; version: number }
  scratch.push({ id: link.id, version: link.version })
}

const analyzeBody = JSON.stringify(TELEMETRY_LINK)
const headers = { 'content-type': 'application/json', cookie }
let nextScratch = 0

type Ctx = { n?: number; link?: { id: number; version: number } }

function mixedRequest(req: any, ctx: Ctx) {
  ctx.link ??= scratch[nextScratch++ % scratch.length]
  const n = (ctx.n = (ctx.n ?? 0) + 1) % 10
  if (n < 6) return { ...req, method: 'POST', path: '/api/analyze', headers, body: analyzeBody }
  if (n < 9) return { ...req, method: 'GET', path: `/api/links/${readIds[n % readIds.length]}`, headers, body: undefined }
  const spec = { ...TELEMETRY_LINK, name: `load scratch save ${ctx.n}` }
  return { ...req, method: 'PATCH', path: `/api/links/${ctx.link!.id}`, headers, body: JSON.stringify({ version: ctx.link!.version, spec }) }
}

function onMixedResponse(status: number, body: string, ctx: Ctx) {
  if (status === 200 && body.includes('"version"') && ctx.link) {
    const parsed = JSON.parse(body) as { id?: number; version?: number }
    if (parsed.id === ctx.link.id && typeof parsed.version === 'number') ctx.link.version = parsed.version
  }
}

function report(name: string, r: autocannon.Result) {
  const errors = r.errors + r.timeouts + r.non2xx
  console.log(
    `${name}: ${r.requests.total} requests in ${r.duration.toFixed(1)} s, ${r.requests.average.toFixed(0)} req/s, ` +
      `latency p50 ${r.latency.p50} ms, p99 ${r.latency.p99} ms, max ${r.latency.max} ms, ` +
      `errors ${errors} (connection ${r.errors}, timeouts ${r.timeouts}, non-2xx ${r.non2xx})`,
  )
}

console.log(`load: ${connections} connections, ${seconds} s per phase, against ${url}`)
const mixed = await autocannon({
  url,
  connections,
  duration: seconds,
  requests: [{ setupRequest: mixedRequest as any, onResponse: onMixedResponse as any }],
})
report('mixed (60 % analysis, 30 % link reads, 10 % saves)', mixed)

const analysis = await autocannon({
  url,
  connections,
  duration: seconds,
  requests: [{ method: 'POST', path: '/api/analyze', headers, body: analyzeBody }],
})
report('analysis only (POST /api/analyze)', analysis)
console.log(`goal: 0 errors and analysis p99 <= 25 ms -> ${analysis.latency.p99 <= 25 && mixed.errors + mixed.non2xx + analysis.non2xx === 0 ? 'met' : 'not met'}`)
