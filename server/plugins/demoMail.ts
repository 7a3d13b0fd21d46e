import { createServer } from 'node:net'
import { SMTPServer } from 'smtp-server'
import { simpleParser } from 'mailparser'
import { useModels } from '../utils/db'
import { useDemoSmtp } from '../utils/mail'

const MAX_MESSAGE_BYTES = 20 * 1024 * 1024

function portIsFree(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const probe = createServer().once('error', () => resolve(false)).once('listening', () => probe.close(() => resolve(true)))
    probe.listen(port, '127.0.0.1')
  })
}

/**
 * In demo mode with no SMTP_HOST, runs a real SMTP server on loopback inside the app and keeps
 * what it receives for the Mailbox page, so invitations, resets and weekly statuses can be read
 * without a mail account. Mail never leaves the machine.
 */
export default defineNitroPlugin(async (nitro) => {
  if (!useRuntimeConfig().public.demoMode || process.env.SMTP_HOST) return
  const first = Number(process.env.BLOOMLINE_DEMO_SMTP_PORT || 2525)
  let port = first
  while (port < first + 20 && !await portIsFree(port)) port++
  if (port >= first + 20) {
    console.warn(`Demo mailbox: no free port from ${first}; mail will wait in the outbox.`)
    return
  }
  const server = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    size: MAX_MESSAGE_BYTES,
    banner: 'Bloomline demo mailbox',
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = []
      // Read now: smtp-server resets the envelope once the reply is sent.
      const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : null
      const envelopeTo = session.envelope.rcptTo.map(r => r.address).join(', ')
      stream.on('data', (chunk: Buffer) => chunks.push(chunk))
      stream.on('end', async () => {
        if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) return callback(Object.assign(new Error('Message too large'), { responseCode: 552 }))
        try {
          const raw = Buffer.concat(chunks).toString('utf8')
          const parsed = await simpleParser(raw)
          await useModels().DemoMail.create({
            envelopeFrom,
            envelopeTo,
            subject: parsed.subject?.slice(0, 300) ?? null,
            raw,
          })
          callback()
        }
        catch (error) {
          callback(Object.assign(new Error(`Could not keep the message: ${(error as Error).message}`), { responseCode: 451 }))
        }
      })
    },
  })
  try {
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject)
      server.listen(port, '127.0.0.1', () => resolve())
    })
  }
  catch (error) {
    // Taken between the check and now, by another process: mail waits in the outbox instead.
    console.warn(`Demo mailbox: could not listen on ${port} (${(error as Error).message}); mail will wait in the outbox.`)
    return
  }
  server.on('error', error => console.error(`Demo mailbox: ${error.message}`))
  useDemoSmtp(port)
  console.log(`Demo mailbox: SMTP on 127.0.0.1:${port}; managers read it on the Mailbox page.`)
  nitro.hooks.hook('close', () => new Promise<void>(resolve => server.close(() => resolve())))
})
