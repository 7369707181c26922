/**
 * Bounded lists: every list route takes ?limit=&offset= with a default and a maximum page
 * size, reads rows in a stable order (ties broken by id), and keeps its body an array; the
 * total and the neighbouring pages travel in headers (X-Total-Count, and an RFC 8288 Link
 * header with rel="next" / rel="prev"), so existing clients keep working.
 */
import { getRequestURL, setHeader, type H3Event } from 'h3'
import { z } from 'zod'
import { validQuery } from './validation'

export interface Page {
  limit: number
  offset: number
}

/** The page query of a list whose pages hold `defaultLimit` rows unless asked, at most `maxLimit`. */
export function pageQuery(defaultLimit: number, maxLimit: number) {
  return z.object({
    limit: z.coerce.number().int('limit must be an integer').min(1, 'limit must be at least 1').max(maxLimit, `limit must be at most ${maxLimit}`).default(defaultLimit),
    offset: z.coerce.number().int('offset must be an integer').min(0, 'offset must be at least 0').max(1_000_000, 'offset must be at most 1000000').default(0),
  })
}

// building a zod schema costs far more than using one: one per page size, made once
const pageQueries = new Map<string, ReturnType<typeof pageQuery>>()

/** Read and check the page of a list route (400 naming limit or offset). */
export function validPage(event: H3Event, defaultLimit: number, maxLimit: number): Promise<Page> {
  const key = `${defaultLimit}/${maxLimit}`
  let schema = pageQueries.get(key)
  if (!schema) pageQueries.set(key, (schema = pageQuery(defaultLimit, maxLimit)))
  return validQuery(event, schema)
}

/** Send one page: the items as the body, the total and the next/previous pages in headers. */
export function sendPage<T>(event: H3Event, items: T[], total: number, page: Page): T[] {
  setHeader(event, 'X-Total-Count', String(total))
  const url = getRequestURL(event)
  const at = (offset: number) => {
    const u = new URL(url.pathname + url.search, 'http://list')
    u.searchParams.set('limit', String(page.limit))
    u.searchParams.set('offset', String(offset))
    return `<${u.pathname}${u.search}>`
  }
  const links: string[] = []
  if (page.offset + items.length < total) links.push(`${at(page.offset + page.limit)}; rel="next"`)
  if (page.offset > 0) links.push(`${at(Math.max(0, page.offset - page.limit))}; rel="prev"`)
  if (links.length) setHeader(event, 'Link', links.join(', '))
  return items
}

/** Page sizes per list: [default, maximum]. */
export const PAGE_SIZES = {
  captures: [20, 100],
  datasheets: [50, 200],
  revisions: [50, 200],
  parts: [200, 500],
  links: [200, 500],
} as const satisfies Record<string, readonly [number, number]>
