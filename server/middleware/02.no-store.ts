/**
 * Signed-in pages and API answers are never stored by a browser or a shared cache
 * (ASVS 8.2.1): `Cache-Control: no-store` on every /api/ response and every page; the
 * built assets under /_nuxt/ and the fonts keep their own long caching.
 */
export default defineEventHandler((event) => {
  const path = event.path
  if (path.startsWith('/_nuxt/') || path.startsWith('/fonts/') || /\.(svg|ico|png|woff2?|css|js)$/.test(path.split('?')[0]!)) return
  setResponseHeader(event, 'Cache-Control', 'no-store')
})
