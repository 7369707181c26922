/**
 * Requests with `Authorization: Bearer <token>` (scripts, CI, the bitslack command line): the
 * token is resolved to its owner, narrowed to its team and scope (the guards in
 * server/utils/access.ts read event.context.apiToken), counted against a per-token rate, and
 * each use is written to the team's audit log once the answer is sent. A token reaches the
 * team's data and the engine only: account routes (sign-in, sessions, tokens, password),
 * invitations, the review queue and pages need a signed-in browser.
 */
import { LRUCache } from 'lru-cache'
import { recordTokenUse, resolveApiToken } from '../domain/api-tokens'

/** Paths a token may call: the team's data, the engine, downloads of links, reports and files. */
const TOKEN_ROUTES = [
  /^\/api\/(analyze|teams|projects|links|parts|reports|captures)(\/|$)/,
  /^\/api\/(config|health|openapi\.json)$/,
  /^\/(links|reports)\/\d+\/[a-z]+\.(json|pdf|csv)$/,
  /^\/(captures|datasheets)\/\d+\/file$/,
]

function perMinute(): number {
  const v = Number(process.env.BITSLACK_TOKEN_REQUESTS_PER_MINUTE)
  return Number.isInteger(v) && v > 0 ? v : 600
}

/** Requests per token in the current minute, in this process (each process of a deployment counts its own). */
const windows = new LRUCache<number, { start: number; count: number }>({ max: 10_000, ttl: 120_000 })

export default defineEventHandler(async (event) => {
  const header = getRequestHeader(event, 'authorization')
  if (!header) return
  const bearer = /^Bearer\s+(\S+)\s*$/i.exec(header)?.[1]
  const unauthorized = (message: string) => {
    setResponseHeader(event, 'WWW-Authenticate', 'Bearer realm="bitslack", error="invalid_token"')
    return createError({ statusCode: 401, statusMessage: message })
  }
  if (!bearer) throw unauthorized('Authorization: send Bearer followed by an API token')
  const token = await resolveApiToken(bearer)
  if (!token) throw unauthorized('the API token is unknown, revoked or expired')
  const path = event.path.split('?')[0]!
  if (!TOKEN_ROUTES.some((r) => r.test(path))) throw createError({ statusCode: 403, statusMessage: 'API tokens reach the team\'s data and the engine; this route needs a signed-in browser' })

  const now = Date.now()
  let w = windows.get(token.id)
  if (!w || now - w.start >= 60_000) windows.set(token.id, (w = { start: now, count: 0 }))
  if (++w.count > perMinute()) {
    setResponseHeader(event, 'Retry-After', Math.max(1, Math.ceil((w.start + 60_000 - now) / 1000)))
    throw createError({ statusCode: 429, statusMessage: `more than ${perMinute()} requests a minute with this token; try again shortly` })
  }

  event.context.apiToken = token
  event.context.sessionUser = token.user
  event.context.sessionId = undefined
  const ip = clientIp(event)
  event.node.res.once('finish', () => {
    recordTokenUse(token, { method: event.method, path, status: event.node.res.statusCode, ip }).catch((err) =>
      console.error('[bitslack] token use not recorded:', err instanceof Error ? err.message : err),
    )
  })
})
