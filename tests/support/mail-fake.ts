/**
 * The test tier's SMTP fake: smtp-server on loopback (ephemeral port), every received
 * message parsed with mailparser into an in-memory array. Test files run in workers,
 * so the global setup also serves the array on a loopback HTTP endpoint:
 *   GET    /mails?to=ADDR&subject=TEXT&count=N&wait=MS   matching mails (waits up to MS for N of them, default 1)
 *   DELETE /mails                                forget every mail
 *   POST   /smtp/down, /smtp/up                  refuse (421, try later) or accept new mail
 * Waiting is event-driven (resolved when a mail arrives), not polling.
 */
import { EventEmitter } from 'node:events'
import { createServer, type Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import { simpleParser, type AddressObject } from 'mailparser'
import { SMTPServer } from 'smtp-server'

export interface FakeMail {
  /** envelope recipients, lower case */
  to: string[]
  from: string
  subject: string
  text: string
  html: string
  receivedAt: string
}

function addresses(a: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(a) ? a : a ? [a] : []
  return list.flatMap((o) => o.value.map((v) => (v.address ?? '').toLowerCase()))
}

export interface MailFake {
  smtpPort: number
  url: string
  mails: FakeMail[]
  close(): Promise<void>
}

export async function startMailFake(): Promise<MailFake> {
  const mails: FakeMail[] = []
  const arrivals = new EventEmitter()
  arrivals.setMaxListeners(100)

  let down = false
  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onMailFrom(_address, _session, callback) {
      if (!down) return callback()
      callback(Object.assign(new Error('mail service not available, try again later'), { responseCode: 421 }))
    },
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const envelope = session.envelope.rcptTo.map((r) => r.address.toLowerCase())
          mails.push({
            to: envelope.length ? envelope : addresses(parsed.to),
            from: addresses(parsed.from)[0] ?? '',
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : '',
            receivedAt: new Date().toISOString(),
          })
          arrivals.emit('mail')
          callback()
        })
        .catch((err: Error) => callback(err))
    },
  })
  await new Promise<void>((resolve) => smtp.listen(0, '127.0.0.1', () => resolve()))
  const smtpPort = (smtp.server.address() as AddressInfo).port

  const matching = (to: string | null, subject: string | null) =>
    mails.filter((m) => (!to || m.to.includes(to.toLowerCase())) && (!subject || m.subject.includes(subject)))

  const http: Server = createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://127.0.0.1')
    if (req.method === 'POST' && (url.pathname === '/smtp/down' || url.pathname === '/smtp/up')) {
      down = url.pathname === '/smtp/down'
      res.writeHead(204).end()
      return
    }
    if (url.pathname !== '/mails') {
      res.writeHead(404).end()
      return
    }
    if (req.method === 'DELETE') {
      mails.length = 0
      res.writeHead(204).end()
      return
    }
    const to = url.searchParams.get('to')
    const subject = url.searchParams.get('subject')
    const wait = Math.min(Number(url.searchParams.get('wait') || 0), 30_000)
    const count = Math.max(1, Number(url.searchParams.get('count') || 1))
    const answer = () => {
      res.writeHead(200, { 'content-type': 'application/json' }).end(JSON.stringify(matching(to, subject)))
    }
    if (matching(to, subject).length >= count || !wait) return answer()
    const timer = setTimeout(done, wait)
    function done() {
      clearTimeout(timer)
      arrivals.off('mail', onMail)
      answer()
    }
    function onMail() {
      if (matching(to, subject).length >= count) done()
    }
    arrivals.on('mail', onMail)
  })
  await new Promise<void>((resolve) => http.listen(0, '127.0.0.1', () => resolve()))
  const url = `http://127.0.0.1:${(http.address() as AddressInfo).port}`

  return {
    smtpPort,
    url,
    mails,
    async close() {
      await new Promise<void>((resolve) => http.close(() => resolve()))
      await new Promise<void>((resolve) => smtp.close(() => resolve()))
    },
  }
}
