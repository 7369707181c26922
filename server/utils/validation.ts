/**
 * Validation of params, query and body with the shared zod schemas. A failure is an
 * InvalidError (400 naming the field), never a 404 and never a 500.
 */
import type { H3Event } from 'h3'
import { z } from 'zod'
import { InvalidError } from './errors'

/**
 * A positive integer id in a route parameter or query: strict decimal digits only (no
 * "0x2", "1e3", " 7" or "+7", which a plain number coercion would accept).
 */
export const IdParam = z.union([z.number(), z.string()], { error: 'must be a positive integer' })
  .transform((v, ctx) => {
    const s = String(v)
    if (!/^[1-9][0-9]{0,9}$/.test(s)) {
      ctx.addIssue({ code: 'custom', message: 'must be a positive integer in decimal digits' })
      return z.NEVER
    }
    return Number(s)
  })
  .pipe(z.number().max(2 ** 31 - 1, 'is out of range'))

const idParamSchemas = new Map<string, z.ZodType>()

/**
 * Route params `{ [name]: id }` for one or more id parameters. Routes ask on every request, and
 * building a zod schema costs far more than using one: each set of names is built once.
 */
export function idParams<K extends string>(...names: K[]) {
  const key = names.join(',')
  let schema = idParamSchemas.get(key)
  if (!schema) idParamSchemas.set(key, (schema = z.object(Object.fromEntries(names.map((n) => [n, IdParam])) as Record<K, typeof IdParam>)))
  return schema as z.ZodObject<Record<K, typeof IdParam>>
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

/** A JSON route reads only JSON: another content type is a 415 before anything is parsed. */
export function requireJson(event: H3Event) {
  const type = (getHeader(event, 'content-type') ?? '').split(';')[0]!.trim().toLowerCase()
  const length = Number(getHeader(event, 'content-length') ?? '0')
  const hasBody = length > 0 || getHeader(event, 'transfer-encoding') !== undefined
  if (hasBody && type !== 'application/json' && !type.endsWith('+json'))
    throw createError({ statusCode: 415, statusMessage: `send the body as application/json (got ${(type || 'no content type').slice(0, 60)})` })
}

export async function validBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  requireJson(event)
  const result = await readValidatedBody(event, (b) => schema.safeParse(b ?? {}))
  if (!result.success) throw InvalidError.fromZod(result.error)
  return result.data
}
