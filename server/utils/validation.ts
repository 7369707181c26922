/**
 * Validation of params, query and body with the shared zod schemas. A failure is an
 * InvalidError (400 naming the field), never a 404 and never a 500.
 */
import type { H3Event } from 'h3'
import { z } from 'zod'
import { InvalidError } from './errors'

/** A positive integer id in a route parameter. */
export const IdParam = z.coerce
  .number({ error: 'must be a number' })
  .int('must be an integer')
  .positive('must be a positive integer')
  .max(2 ** 31 - 1, 'is out of range')

/** Route params `{ [name]: id }` for one or more id parameters. */
export function idParams<K extends string>(...names: K[]) {
  return z.object(Object.fromEntries(names.map((n) => [n, IdParam])) as Record<K, typeof IdParam>)
}

export async function validParams<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  const result = await getValidatedRouterParams(event, (p) => schema.safeParse(p))
  if (!result.success) throw InvalidError.fromZod(result.error)
  return result.data
}

export async function validQuery<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  const result = await getValidatedQuery(event, (q) => schema.safeParse(q))
  if (!result.success) throw InvalidError.fromZod(result.error)
  return result.data
}

export async function validBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  const result = await readValidatedBody(event, (b) => schema.safeParse(b ?? {}))
  if (!result.success) throw InvalidError.fromZod(result.error)
  return result.data
}
