/**
 * Heavy requests take a place at the process's gate (server/utils/load-shed.ts) and give it
 * back when their response is finished or the client goes away; a full gate answers 503
 * with Retry-After before any work is done.
 */
export default defineEventHandler(async (event) => {
  const kind = heavyKind(event)
  if (!kind) return
  let release: () => void
  try {
    release = await heavyGate(kind).enter()
  } catch (err) {
    setResponseHeader(event, 'Retry-After', 2)
    throw err
  }
  event.node.res.once('close', release)
  event.node.res.once('finish', release)
})
