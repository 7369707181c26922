/**
 * A page rendered on the server resolves its session once, before the render: the data calls
 * the render makes in-process for it then reuse that answer (server/utils/access.ts) instead of
 * unsealing the cookie and reading the session row once each.
 */
export default defineEventHandler(async (event) => {
  const path = event.path
  if (path.startsWith('/api/') || path.startsWith('/_') || /\.\w+$/.test(path.split('?')[0]!) || !getRequestHeader(event, 'cookie')) return
  await getSessionUser(event)
})
