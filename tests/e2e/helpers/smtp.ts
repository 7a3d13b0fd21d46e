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
  /** Answer every message with this temporary failure (4xx) instead of accepting it. */
  refuse?: boolean
}

/**
 * A real SMTP server on loopback (smtp-server), for tests: it keeps every message it accepts,
 * parsed with mailparser, and can be stopped and started again on the same port.
 */
export async function startSmtp(port = smtpPort, behaviour: SmtpBehaviour = {}) {
  const received: ReceivedMail[] = []
  let server: SMTPServer | undefined

  function make() {
    return new SMTPServer({
      secure: false,
      authOptional: true,
      disabledCommands: ['AUTH', 'STARTTLS'],
      logger: false,
      onData(stream, session: SMTPServerSession, callback) {
        const chunks: Buffer[] = []
        stream.on('data', (chunk: Buffer) => chunks.push(chunk))
        stream.on('end', async () => {
          if (behaviour.delayMs) await new Promise(r => setTimeout(r, behaviour.delayMs))
          if (behaviour.refuse) return callback(Object.assign(new Error('Try again later'), { responseCode: 451 }))
          const raw = Buffer.concat(chunks).toString('utf8')
          // Kept only once accepted: a sender that died before the reply has not delivered.
          callback()
          received.push({ envelopeTo: session.envelope.rcptTo.map(r => r.address), raw, parsed: await simpleParser(raw) })
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
        if (Date.now() > deadline) throw new Error(`Mail did not arrive in ${timeoutMs} ms; ${received.length} message(s) so far.`)
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
