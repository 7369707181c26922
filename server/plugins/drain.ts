/**
 * A worker of the cluster launcher (scripts/serve.ts) leaves without dropping a request.
 * On the launcher's "drain" message it stops taking new connections (the launcher hands
 * them to its other workers), answers every further request on an open connection with
 * `Connection: close`, so a client never reuses a connection the worker is about to shut,
 * and reports "drained" once no connection is left (or after the keep-alive timeout, when
 * an idle connection would close anyway). Only then is it told to stop.
 */
import net from 'node:net'
import type { Server } from 'node:http'

const DRAIN = 'bitslack:drain'
const DRAINED = 'bitslack:drained'

export default defineNitroPlugin((nitroApp) => {
  if (!process.send) return // not a cluster worker
  let server: Server | undefined
  let draining = false

  nitroApp.hooks.hook('request', (event) => {
    server ??= (event.node.req.socket as net.Socket & { server?: Server }).server
    if (draining && !event.node.res.headersSent) event.node.res.setHeader('connection', 'close')
  })

  process.on('message', (message: unknown) => {
    if (message !== DRAIN || draining) return
    draining = true
    const done = () => process.send?.(DRAINED)
    // a worker that never answered a request holds no kept-alive connection: the launcher's disconnect closes its listener
    if (!server) return done()
    const open = server
    // stop listening only: http.Server.close would also drop idle kept-alive connections, which a client may be reusing this instant
    net.Server.prototype.close.call(open)
    // Nitro's graceful stop closes the server again later: a listener already stopped is not an error there
    const closeAgain = open.close.bind(open)
    open.close = ((cb?: (err?: Error) => void) => closeAgain(() => cb?.())) as typeof open.close
    const deadline = Date.now() + open.keepAliveTimeout + 1000
    const poll = () =>
      open.getConnections((_err, count) => {
        if (!count || Date.now() > deadline) done()
        else setTimeout(poll, 50)
      })
    poll()
  })
})
