/**
 * Cross-site request protection for every mutating API call: the browser's own
 * Sec-Fetch-Site and Origin headers must say the request comes from this app's origin
 * (OWASP CSRF cheat sheet, "verifying origin with standard headers"). Requests without
 * those headers (server-to-server clients, tests) carry no browser cookies of a victim.
 * The session cookie is SameSite=Lax as a second line. A request with an API token
 * (Authorization: Bearer, server/middleware/00.api-token.ts) is not a browser's: a page on
 * another site cannot make a browser send one, so the check does not apply to it.
 */
const SAFE = new Set(['GET', 'HEAD', 'OPTIONS'])

export default defineEventHandler((event) => {
  if (SAFE.has(event.method) || !event.path.startsWith('/api/') || event.context.apiToken) return
  const refuse = () => {
    throw createError({ statusCode: 403, statusMessage: 'Cross-site request refused' })
  }
  if (getHeader(event, 'sec-fetch-site') === 'cross-site') refuse()
  const origin = getHeader(event, 'origin')
  if (origin === undefined) return
  let originHost: string
  try {
    originHost = new URL(origin).host
  } catch {
    return refuse()
  }
  // X-Forwarded-Host names the public host only behind a proxy that sets it (BITSLACK_TRUST_PROXY=1)
  if (originHost !== getRequestHost(event, { xForwardedHost: trustProxy() })) refuse()
})
