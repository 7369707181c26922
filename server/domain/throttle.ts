/**
 * Throttles kept in PostgreSQL, so they hold across restarts and across every
 * server process: a counter per bucket and key within a window (sign-ups per address, reset
 * requests per address and per account, invitation accepts per address and per invitation),
 * and the sign-in back-off (sign_in_attempts). None can lock anyone out for long: a limit
 * answers 429 with the seconds to wait, and the sign-in back-off is per account *and* address.
 */
import { Op } from 'sequelize'
import { RateEvent, SignInAttempt } from '../db/models'
import { RateLimitedError } from '../utils/errors'
import { signInLimits } from '../utils/settings'

/** Seconds until the oldest event inside the window leaves it. */
function retryAfter(oldest: Date, windowSeconds: number): number {
  return Math.max(1, Math.ceil((oldest.getTime() + windowSeconds * 1000 - Date.now()) / 1000))
}

/** How many events of `bucket` and `key` fell inside the last `windowSeconds`, and the oldest of the last `limit`. */
async function recent(bucket: string, key: string, limit: number, windowSeconds: number) {
  const rows = await RateEvent.findAll({
    where: { bucket, key, at: { [Op.gt]: new Date(Date.now() - windowSeconds * 1000) } },
    order: [['at', 'DESC']],
    limit,
    attributes: ['at'],
  })
  return { count: rows.length, oldest: rows[rows.length - 1]?.at }
}

/** Count one event; 429 (with the seconds to wait) when `max` events of the key already fell in the window. */
export async function throttle(bucket: string, key: string, max: number, windowSeconds: number): Promise<void> {
  const r = await recent(bucket, key, max, windowSeconds)
  if (r.count >= max) throw new RateLimitedError(retryAfter(r.oldest!, windowSeconds))
  await RateEvent.create({ bucket, key })
}

/** Whether `max` events of the key fell in the window (a silent limit: the caller answers as usual). */
export async function overLimit(bucket: string, key: string, max: number, windowSeconds: number): Promise<boolean> {
  const r = await recent(bucket, key, max, windowSeconds)
  if (r.count >= max) return true
  await RateEvent.create({ bucket, key })
  return false
}

/** Events older than a day count for nothing: the tables stay small. */
export async function pruneThrottles(): Promise<void> {
  const dayAgo = new Date(Date.now() - 86_400_000)
  await RateEvent.destroy({ where: { at: { [Op.lt]: dayAgo } } })
  await SignInAttempt.destroy({ where: { at: { [Op.lt]: dayAgo } } })
}

/** Exponential back-off: after `free` failures, 1 s, 2 s, 4 s ... up to `cap` seconds after the last one. */
function backoffSeconds(failures: number, free: number, cap: number): number {
  return failures < free ? 0 : Math.min(cap, 2 ** (failures - free))
}

/**
 * Refuse a sign-in attempt that comes too soon: per account and address, an exponential
 * back-off after a few failures (the owner signing in from another address is never held
 * up by it); per address across accounts, a back-off once the address has many failures
 * (a password-spraying address slows down; the people behind it wait seconds, not a window).
 */
export async function refuseSignInTooSoon(email: string, ip: string): Promise<void> {
  const { perAddress: free, perIp, windowSeconds, maxBackoffSeconds } = signInLimits()
  const since = new Date(Date.now() - windowSeconds * 1000)
  const checks: [Record<string, string>, number][] = [
    [{ email, ip }, free],
    [{ ip }, perIp],
  ]
  for (const [where, threshold] of checks) {
    const failures = await SignInAttempt.findAll({ where: { ...where, succeeded: false, at: { [Op.gt]: since } }, order: [['at', 'DESC']], limit: threshold + 12, attributes: ['at'] })
    const wait = backoffSeconds(failures.length, threshold, maxBackoffSeconds)
    if (wait > 0) {
      const until = failures[0]!.at.getTime() + wait * 1000
      if (until > Date.now()) throw new RateLimitedError(Math.ceil((until - Date.now()) / 1000))
    }
  }
}

/** Record a sign-in attempt; a success clears that account's failures from that address. */
export async function recordSignIn(email: string, ip: string, succeeded: boolean): Promise<void> {
  await SignInAttempt.create({ email, ip, succeeded })
  if (succeeded) await SignInAttempt.destroy({ where: { email, ip, succeeded: false } })
}
