/**
 * A tiny HTTP client with its own cookie jar: one per user, so each test speaks as that
 * user's browser would (the sealed session cookie of nuxt-auth-utils).
 */
import { inject } from 'vitest'

export interface ApiResponse<T = any> {
  status: number
  data: T
  headers: Headers
}

export interface ApiClient {
  request<T = any>(method: string, path: string, body?: unknown, headers?: Record<string, string>): Promise<ApiResponse<T>>
  get<T = any>(path: string): Promise<ApiResponse<T>>
  post<T = any>(path: string, body?: unknown): Promise<ApiResponse<T>>
  patch<T = any>(path: string, body?: unknown): Promise<ApiResponse<T>>
  delete<T = any>(path: string): Promise<ApiResponse<T>>
  /** forget the session cookie */
  reset(): void
  /** a second client holding the same cookies (a sign-out or sign-up on it leaves this one as it is) */
  clone(opts?: { ip?: string; baseURL?: string; bearer?: string }): ApiClient
  readonly signedIn: boolean
  /** the Cookie header this client sends (for multipart uploads by hand) */
  readonly cookie: string
}

/** A client address of its own per client (the suite's server trusts X-Forwarded-For): the per-address throttles of one test never hold up another. */
function randomIp(): string {
  const b = () => Math.floor(Math.random() * 254) + 1
  return `10.${b()}.${b()}.${b()}`
}

/**
 * A client of the suite's server, or of another one (baseURL: a spare server, the proxy of the
 * scale-out tests); with `bearer`, a script's client that sends an API token on every request.
 */
export function apiClient(opts: { ip?: string; baseURL?: string; bearer?: string } = {}, cookies?: Map<string, string>): ApiClient {
  const baseURL = opts.baseURL ?? inject('baseURL')
  opts = { ...opts, ip: opts.ip ?? randomIp() }
  const jar = new Map<string, string>(cookies)
  const request = async <T>(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<ApiResponse<T>> => {
    const res = await fetch(`${baseURL}${path}`, {
      method,
      headers: {
        accept: 'application/json',
        ...(body !== undefined ? { 'content-type': 'application/json' } : {}),
        ...(jar.size ? { cookie: [...jar].map(([k, v]) => `${k}=${v}`).join('; ') } : {}),
        ...(opts.ip ? { 'x-forwarded-for': opts.ip } : {}),
        ...(opts.bearer ? { authorization: `Bearer ${opts.bearer}` } : {}),
        ...headers,
      },
      body: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body),
      redirect: 'manual',
    })
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';')
      const eq = pair!.indexOf('=')
      const name = pair!.slice(0, eq).trim()
      const value = pair!.slice(eq + 1).trim()
      if (!value || /max-age=0|expires=thu, 01 jan 1970/i.test(c)) jar.delete(name)
      else jar.set(name, value)
    }
    const text = await res.text()
    let data: unknown = text
    if ((res.headers.get('content-type') ?? '').includes('json') && text) data = JSON.parse(text)
    return { status: res.status, data: data as T, headers: res.headers }
  }
  return {
    request,
    get: (p) => request('GET', p),
    post: (p, b) => request('POST', p, b),
    patch: (p, b) => request('PATCH', p, b),
    delete: (p) => request('DELETE', p),
    reset: () => jar.clear(),
    clone: (o) => apiClient({ ...opts, ...o }, jar),
    get signedIn() {
      return jar.size > 0
    },
    get cookie() {
      return [...jar].map(([k, v]) => `${k}=${v}`).join('; ')
    },
  }
}
