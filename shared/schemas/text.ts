/**
 * Text hygiene for every free-text field (issue 13): PostgreSQL text cannot hold a NUL
 * character, and a lone UTF-16 surrogate is not text at all. One refinement, applied by
 * each schema's text fields, so both are refused with a 400 naming the field.
 */
import { z } from 'zod'

const BAD_CHARS = /\u0000|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/

/** The text has no NUL character and no unpaired surrogate. */
export function isCleanText(s: string): boolean {
  return !BAD_CHARS.test(s)
}

/** A string schema that also refuses NUL characters and unpaired surrogates. */
export function cleanText<T extends z.ZodString>(schema: T, what: string): T {
  return schema.refine(isCleanText, { message: `${what} must not contain NUL characters or unpaired surrogates` }) as unknown as T
}
