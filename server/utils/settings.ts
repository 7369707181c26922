/**
 * Deployment settings read from the environment at run time (not baked in at build):
 * where the app is reached, how mail leaves, how clients are identified. The
 * environment kind is BITSLACK_ENV: demo and development use the local fakes; anything
 * else (and an unset value) is production, which must configure SMTP explicitly.
 */
export type AppEnv = 'production' | 'demo' | 'development' | 'test'

export function appEnv(): AppEnv {
  const v = process.env.BITSLACK_ENV
  return v === 'demo' || v === 'development' || v === 'test' ? v : 'production'
}

/** The app's public address for links in mails: APP_URL, else where this server listens (HOST and PORT). */
export function appUrl(): string {
  if (process.env.APP_URL) return process.env.APP_URL.replace(/\/+$/, '')
  const host = process.env.HOST || process.env.NITRO_HOST || 'localhost'
  const port = process.env.PORT || process.env.NITRO_PORT || '3000'
  // a wildcard or loopback bind address is reached as localhost
  const shown = ['0.0.0.0', '::', '127.0.0.1', '::1', ''].includes(host) ? 'localhost' : host
  return `http://${shown.includes(':') ? `[${shown}]` : shown}:${port}`
}

export interface SmtpSettings {
  host: string
  port: number
  user?: string
  pass?: string
  from: string
  /** a local fake on loopback: plain SMTP, no STARTTLS */
  local: boolean
}

/** SMTP settings; production requires SMTP_HOST and SMTP_FROM, demo/dev/test default to the local fake. */
export function smtpSettings(): SmtpSettings {
  const production = appEnv() === 'production'
  const host = process.env.SMTP_HOST || (production ? '' : '127.0.0.1')
  const from = process.env.SMTP_FROM || (production ? '' : 'Bitslack <no-reply@bitslack.localhost>')
  if (!host || !from) throw new Error('SMTP_HOST and SMTP_FROM must be set in production (BITSLACK_ENV unset or production)')
  const port = Number(process.env.SMTP_PORT || (production ? 587 : 1025))
  if (!Number.isInteger(port) || port <= 0 || port > 65535) throw new Error(`SMTP_PORT is not a port: ${process.env.SMTP_PORT}`)
  return {
    host,
    port,
    user: process.env.SMTP_USER || undefined,
    pass: process.env.SMTP_PASS || undefined,
    from,
    local: !production,
  }
}

/** The fake's web inbox the UI links to: MAIL_INBOX_URL, else maildev's in demo and development, null otherwise. */
export function mailInboxUrl(): string | null {
  if (process.env.MAIL_INBOX_URL) return process.env.MAIL_INBOX_URL
  const env = appEnv()
  return env === 'demo' || env === 'development' ? 'http://127.0.0.1:1080' : null
}

/** Trust X-Forwarded-For for the client IP: only behind a reverse proxy that sets it (BITSLACK_TRUST_PROXY=1). */
export function trustProxy(): boolean {
  return process.env.BITSLACK_TRUST_PROXY === '1'
}

export interface SignInLimits {
  /** failures of one account from one client address before the back-off starts */
  perAddress: number
  /** failures from one client address (all accounts) before its back-off starts */
  perIp: number
  /** how long a failure counts, seconds */
  windowSeconds: number
  /** the longest back-off, seconds */
  maxBackoffSeconds: number
}

export function signInLimits(): SignInLimits {
  const n = (name: string, fallback: number) => {
    const v = Number(process.env[name])
    return Number.isInteger(v) && v > 0 ? v : fallback
  }
  return {
    perAddress: n('BITSLACK_SIGN_IN_MAX_PER_ADDRESS', 5),
    perIp: n('BITSLACK_SIGN_IN_MAX_PER_IP', 30),
    windowSeconds: n('BITSLACK_SIGN_IN_WINDOW_SECONDS', 15 * 60),
    maxBackoffSeconds: n('BITSLACK_SIGN_IN_MAX_BACKOFF_SECONDS', 5 * 60),
  }
}

/** Session lifetimes: absolute (from sign-in) and idle (since the last request), milliseconds. */
export function sessionLimits(): { maxAgeMs: number; idleMs: number } {
  const hours = (name: string, fallback: number) => {
    const v = Number(process.env[name])
    return (Number.isFinite(v) && v > 0 ? v : fallback) * 3_600_000
  }
  return { maxAgeMs: hours('BITSLACK_SESSION_MAX_AGE_HOURS', 7 * 24), idleMs: hours('BITSLACK_SESSION_IDLE_HOURS', 12) }
}

/**
 * Database pool sizes for one server process. The deployment has a budget of connections
 * (BITSLACK_DB_CONNECTIONS, default 60: PostgreSQL allows 100 by default, the rest is left
 * for migrations, backups and psql) shared by the BITSLACK_WORKERS processes of one host
 * (set by scripts/serve.ts); each process keeps 3 for the job queue and the rest, between
 * 4 and 20, for requests. BITSLACK_DB_POOL_MAX overrides the request pool.
 */
export function dbPoolSizes(): { requests: number; jobs: number } {
  const int = (name: string, fallback: number) => {
    const v = Number(process.env[name])
    return Number.isInteger(v) && v > 0 ? v : fallback
  }
  const jobs = 3
  const share = Math.floor(int('BITSLACK_DB_CONNECTIONS', 60) / int('BITSLACK_WORKERS', 1))
  return { requests: int('BITSLACK_DB_POOL_MAX', Math.min(20, Math.max(4, share - jobs))), jobs }
}
