import { SMTPServer, type SMTPServerSession } from 'smtp-server'
import { simpleParser, type ParsedMail } from 'mailparser'

/** The port the app under test sends mail to (scripts/test.mjs sets SMTP_PORT to the same). */
export const smtpPort = Number(process.env.SMTP_PORT || Number(process.env.BLOOMLINE_TEST_PORT) + 1000)

/** One message as it arrived: the envelope, the raw source and mailparser's reading of it. */
export interface ReceivedMail {
  envelopeTo: string[]
  raw: string
  parsed: ParsedMail
}

/** What a test can make the server do to the next messages. */
export interface SmtpBehaviour {
  /** Wait this long before accepting each message's data (to catch a sender mid-send). */
  delayMs?: number
  /** Answer every message with a temporary failure (451) instead of accepting it. */
  refuse?: boolean
  /** Refuse these recipients for good (550), as a server does for an address it does not have. */
  rejectRecipients?: string[]
}

/**
 * A real SMTP server on loopback (smtp-server), for tests: it keeps every message it accepts,
 * parsed with mailparser, and can be stopped and started again on the same port.
 */
export async function startSmtp(port = smtpPort, behaviour: SmtpBehaviour = {}) {
  const received: ReceivedMail[] = []
  // Connections whose client has gone (closed, or its process killed), by session id.
  const closed = new Set<string>()
  let server: SMTPServer | undefined

  function make() {
    return new SMTPServer({
      secure: false,
      authOptional: true,
      disabledCommands: ['AUTH', 'STARTTLS'],
      logger: false,
      onRcptTo(address, _session, callback) {
        if (behaviour.rejectRecipients?.some(r => r.toLowerCase() === address.address.toLowerCase())) {
          return callback(Object.assign(new Error('No such mailbox here'), { responseCode: 550 }))
        }
        callback()
      },
      onClose(session) {
        closed.add(session.id)
      },
      onData(stream, session: SMTPServerSession, callback) {
        const chunks: Buffer[] = []
        // Read now: smtp-server resets the envelope once the reply is sent.
        const envelopeTo = session.envelope.rcptTo.map(r => r.address)
        stream.on('data', (chunk: Buffer) => chunks.push(chunk))
        stream.on('end', async () => {
          if (behaviour.delayMs) await new Promise(r => setTimeout(r, behaviour.delayMs))
          if (behaviour.refuse) return callback(Object.assign(new Error('Try again later'), { responseCode: 451 }))
          // Kept only once accepted: a sender that died before the reply has not delivered.
          if (closed.has(session.id)) return callback(new Error('The client has gone'))
          const raw = Buffer.concat(chunks).toString('utf8')
          callback()
          received.push({ envelopeTo, raw, parsed: await simpleParser(raw) })
        })
      },
    })
  }

  async function start() {
    server = make()
    await new Promise<void>((resolve, reject) => {
      server!.once('error', reject)
      server!.listen(port, '127.0.0.1', () => resolve())
    })
  }

  async function stop() {
    const closing = server
    server = undefined
    if (closing) await new Promise<void>(resolve => closing.close(() => resolve()))
  }

  await start()
  return {
    received,
    behaviour,
    start,
    stop,
    /** The messages to an address, oldest first. */
    to(address: string) {
      return received.filter(m => m.envelopeTo.some(a => a.toLowerCase() === address.toLowerCase()))
    },
    /** Waits until `predicate` holds for what has arrived, or throws after `timeoutMs`. */
    async waitFor(predicate: (mail: ReceivedMail[]) => boolean, timeoutMs = 30_000) {
      const deadline = Date.now() + timeoutMs
      while (!predicate(received)) {
        if (Date.now() > deadline) throw new Error(`Mail did not arrive in ${timeoutMs} ms; ${received.length} message(s) so far, to: ${received.map(m => m.envelopeTo.join(' ')).join(', ') || 'none'}`)
        await new Promise(r => setTimeout(r, 100))
      }
      return received
    },
  }
}

/** The first link in a message's text part that starts with `prefix`. */
export function linkIn(mail: ReceivedMail, prefix: string): string {
  const text = mail.parsed.text ?? ''
  const match = text.match(new RegExp(`${prefix.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}\\S+`))
  if (!match) throw new Error(`No link starting ${prefix} in: ${text.slice(0, 500)}`)
  return match[0]
}
