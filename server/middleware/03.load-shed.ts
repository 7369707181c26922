/**
 * Heavy requests take a place at the process's gate (server/utils/load-shed.ts) and give it
 * back when their response is finished or the client goes away (also while still waiting in
 * line); a full gate answers 503 with Retry-After before any work is done.
 */
export default defineEventHandler(async (event) => {
  const kind = heavyKind(event)
  if (!kind) return
  const res = event.node.res
  // the place is given back when the answer is sent or the client goes away, also while it waits
  const gone = new AbortController()
  let release: (() => void) | undefined
  const done = () => {
    gone.abort()
    release?.()
  }
  res.once('close', done)
  res.once('finish', done)
  try {
    release = await heavyGate(kind).enter(gone.signal)
  } catch (err) {
    setResponseHeader(event, 'Retry-After', 2)
    throw err
  }
  if (gone.signal.aborted) release()
})
