/**
 * Reading the API's error vocabulary (400 with data.issues, 401, 403, 404, 409) from a
 * failed `$fetch`. Checks the status and the payload, never `instanceof`.
 */
export interface ApiIssue {
  path: (string | number)[] | string
  message: string
}

interface FetchLikeError {
  statusCode?: number
  status?: number
  data?: { message?: string; statusMessage?: string; issues?: ApiIssue[]; data?: { issues?: ApiIssue[] } & Record<string, unknown> } & Record<string, unknown>
  message?: string
}

/** HTTP status of a failed request, 0 when the request never reached the server. */
export function apiStatus(err: unknown): number {
  const e = err as FetchLikeError
  return e?.statusCode ?? e?.status ?? 0
}

/** The field issues of a 400, keyed by dotted path. */
export function apiIssues(err: unknown): Record<string, string> {
  const e = err as FetchLikeError
  const list = e?.data?.issues ?? e?.data?.data?.issues ?? []
  const out: Record<string, string> = {}
  for (const i of list) {
    const key = Array.isArray(i.path) ? i.path.join('.') : String(i.path ?? '')
    out[key] ??= i.message
  }
  return out
}

/** One sentence for the user. */
export function apiErrorMessage(err: unknown, fallback = 'The request failed.'): string {
  const e = err as FetchLikeError
  const status = apiStatus(err)
  const issues = Object.values(apiIssues(err))
  if (status === 400 && issues.length) return issues.join('; ')
  const msg = e?.data?.message || e?.data?.statusMessage
  if (msg) return String(msg)
  if (status === 0) return 'The server could not be reached. Check your connection and try again.'
  if (status === 401) return 'Your session has ended. Sign in again.'
  if (status === 403) return 'Your role in this team does not allow this.'
  if (status === 404) return 'Not found, or not shared with you.'
  return fallback
}
