/**
 * A link being set up: the link schema with values still to be entered (`null`). A new link
 * starts with blank stages rather than invented numbers (issue 17); such a draft may be
 * saved, but it is not analysed until every value is there, and its verdict reads
 * "incomplete". Every other field is validated exactly as LinkSpec validates it: an issue
 * counts as a missing value only when the value at its path is null.
 */
import { z } from 'zod'
import { LinkSpec, type Link } from './link'

export type IssuePath = (string | number)[]

export interface LinkDraftCheck {
  /** the complete, parsed link (defaults filled in); null while values are missing or invalid */
  link: Link | null
  /** paths of the values still to be entered */
  missing: IssuePath[]
  /** real problems (not missing values), as LinkSpec reports them */
  issues: { path: IssuePath; message: string }[]
}

/** The value at a path of a JSON-like document (undefined when the path does not exist). */
export function valueAt(doc: unknown, path: readonly PropertyKey[]): unknown {
  let v: unknown = doc
  for (const k of path) {
    if (v === null || typeof v !== 'object') return undefined
    v = (v as Record<PropertyKey, unknown>)[k]
  }
  return v
}

/** Check a link that may still have missing (null) values. */
export function checkLinkDraft(input: unknown): LinkDraftCheck {
  const r = LinkSpec.safeParse(input)
  if (r.success) return { link: r.data, missing: [], issues: [] }
  const missing: IssuePath[] = []
  const issues: LinkDraftCheck['issues'] = []
  for (const i of r.error.issues) {
    const path = i.path.map((p) => (typeof p === 'symbol' ? String(p) : p))
    // the link's identity is never missing: a name, a protocol and the schema version
    const identity = path.length === 1 && ['name', 'protocol', 'schemaVersion'].includes(String(path[0]))
    if (!identity && valueAt(input, path) === null) missing.push(path)
    else issues.push({ path, message: i.message })
  }
  return { link: null, missing, issues }
}

/** The body's `spec`: a complete link, or a draft whose only problems are missing values. */
export const LinkDraftSpec = z.unknown().superRefine((v, ctx) => {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) {
    ctx.addIssue({ code: 'custom', message: 'spec must be a link object' })
    return
  }
  for (const i of checkLinkDraft(v).issues) ctx.addIssue({ code: 'custom', path: i.path, message: i.message })
})
