import { ConnectionError } from 'sequelize'

/** PostgreSQL SQLSTATEs of a server going away (admin shutdown, crash shutdown, cannot connect now). */
const OUTAGE_CODES = new Set(['57P01', '57P02', '57P03', 'ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT'])

/**
 * True when an error means the database is unreachable rather than that the request
 * was wrong: the request then gets a 503 and may be retried; the pool reconnects by
 * itself once the server is back.
 */
export function isDatabaseOutage(err: unknown): boolean {
  if (err instanceof ConnectionError) return true
  const e = err as { original?: { code?: string; message?: string }; parent?: { code?: string }; code?: string; message?: string }
  const code = e?.original?.code ?? e?.parent?.code ?? e?.code
  if (code && OUTAGE_CODES.has(code)) return true
  const message = e?.original?.message ?? e?.message ?? ''
  return /Connection terminated|terminating connection|the database system is (shutting down|starting up)|not queryable|connection error|Connection refused|connect ECONNREFUSED|socket hang up|Client was closed/i.test(message)
}
