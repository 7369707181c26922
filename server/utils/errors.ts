/**
 * The one error vocabulary of the server. Domain code throws these; `defineApiHandler`
 * maps them (and the engine's EngineInputError) to HTTP through `toHttpError`, the one
 * mapping. Anything else is a real fault and stays a 500.
 */
import type { H3Event } from 'h3'
import type { z } from 'zod'
import { EngineInputError } from '../timing/errors'
import { isDatabaseOutage } from './database-outage'

export interface Issue {
  /** the field, as zod names it: ['channels', 0, 'receiver', 'vih'] */
  path: (string | number)[]
  message: string
}

export class DomainError extends Error {}

/** 401: no session, or credentials that do not match. */
export class UnauthorizedError extends DomainError {
  constructor(message = 'sign in first') {
    super(message)
  }
}

/** 403: signed in and a member, but the role does not allow the action. */
export class ForbiddenError extends DomainError {
  constructor(message = 'your role does not allow this') {
    super(message)
  }
}

/** 404: missing, or belonging to a team the caller is not in (indistinguishable on purpose). */
export class NotFoundError extends DomainError {
  constructor(what: string) {
    super(`${what} not found`)
  }
}

/** 409: a stale version, a duplicate, or a rule such as "a team keeps an admin". */
export class ConflictError extends DomainError {
  constructor(
    message: string,
    readonly data?: Record<string, unknown>,
  ) {
    super(message)
  }
}

/** 400: input that fails validation; the message names the first failing field. */
export class InvalidError extends DomainError {
  constructor(readonly issues: Issue[]) {
    super(issues[0] ? describeIssue(issues[0]) : 'invalid input')
  }

  static fromZod(error: z.ZodError, prefix: (string | number)[] = []): InvalidError {
    return new InvalidError(
      error.issues.map((i) => ({ path: [...prefix, ...(i.path as (string | number)[])], message: i.message })),
    )
  }

  static of(path: (string | number)[], message: string): InvalidError {
    return new InvalidError([{ path, message }])
  }
}

/** 429: too many attempts; retry after `retryAfter` seconds. */
export class RateLimitedError extends DomainError {
  constructor(
    readonly retryAfter: number,
    message = 'too many sign-in attempts; try again later',
  ) {
    super(message)
  }
}

function describeIssue(issue: Issue): string {
  const field = issue.path.length ? issue.path.join('.') : 'body'
  return `${field}: ${issue.message}`
}

/** Map a thrown value to an H3 error: the one place where domain errors become statuses. */
export function toHttpError(err: unknown, event?: H3Event) {
  if (err instanceof InvalidError) {
    return createError({ statusCode: 400, statusMessage: err.message, data: { issues: err.issues } })
  }
  if (err instanceof EngineInputError) {
    const issues: Issue[] = err.issues?.length ? err.issues : [{ path: err.path, message: err.message }]
    return createError({ statusCode: 400, statusMessage: describeIssue(issues[0]!), data: { issues } })
  }
  if (err instanceof UnauthorizedError) return createError({ statusCode: 401, statusMessage: err.message })
  if (err instanceof ForbiddenError) return createError({ statusCode: 403, statusMessage: err.message })
  if (err instanceof NotFoundError) return createError({ statusCode: 404, statusMessage: err.message })
  if (err instanceof ConflictError) return createError({ statusCode: 409, statusMessage: err.message, data: err.data })
  if (err instanceof RateLimitedError) {
    if (event) setResponseHeader(event, 'Retry-After', err.retryAfter)
    return createError({ statusCode: 429, statusMessage: err.message, data: { retryAfter: err.retryAfter } })
  }
  if (isDatabaseOutage(err)) {
    if (event) setResponseHeader(event, 'Retry-After', 5)
    return createError({ statusCode: 503, statusMessage: 'the database is unavailable; try again shortly' })
  }
  return err
}

/** defineEventHandler whose domain errors leave as their HTTP status. */
export function defineApiHandler<T>(handler: (event: H3Event) => Promise<T> | T) {
  return defineEventHandler(async (event) => {
    try {
      return await handler(event)
    } catch (err) {
      throw toHttpError(err, event)
    }
  })
}
