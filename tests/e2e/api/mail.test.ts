import nodemailer from 'nodemailer'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { closeSequelize } from '../../../server/database/connection'
import { stopJobs } from '../../../server/utils/jobs'
import { queueMail } from '../../../server/utils/mail'
import type { DeliveryLogView, DemoMailSummary, DemoMailView } from '../../../shared/types/mail'
import { request, signedIn } from '../helpers/http'
import { signedInAt, startInstance } from '../helpers/instance'
import { startSmtp } from '../helpers/smtp'

// The outbox end to end: this test process queues messages exactly as the app's routes do
// (queueMail writes the row and sends a pg-boss job); the app under test, and in one case a
// second instance, sends them to a real SMTP server on loopback.

let smtp: Awaited<ReturnType<typeof startSmtp>>
let db: pg.Client
let organisationId: number
const run = Date.now().toString(36)
const address = (n: string) => `mailtest-${n}-${run}@larkspur.example`

async function queue(n: string, subject = `Test message ${n}`) {
  return queueMail({
    organisationId,
    recipientUserId: null,
    to: address(n),
    toName: `Test ${n}`,
    kind: 'invitation',
    periodKey: `mailtest-${n}-${run}`,
    message: { subject, html: `<p>Hello <b>${n}</b></p>`, text: `Hello ${n}` },
  })
}

async function outboxRow(id: number) {
  const { rows } = await db.query('SELECT status, attempts, last_error, message_id FROM mail_outbox WHERE id = $1', [id])
  return rows[0] as { status: string, attempts: number, last_error: string | null, message_id: string }
}

async function until<T>(what: () => Promise<T>, ok: (value: T) => boolean, timeoutMs = 30_000): Promise<T> {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const value = await what()
    if (ok(value)) return value
    if (Date.now() > deadline) throw new Error(`Timed out; last value ${JSON.stringify(value)}`)
    await new Promise(r => setTimeout(r, 200))
  }
}

const settle = () => new Promise(r => setTimeout(r, 3000))

beforeAll(async () => {
  smtp = await startSmtp()
  db = new pg.Client({ connectionString: process.env.DATABASE_URL })
  await db.connect()
  const { rows } = await db.query(`SELECT id FROM organisations WHERE name = 'Larkspur Hollow Kennel'`)
  organisationId = rows[0].id
})

afterAll(async () => {
  await stopJobs()
  await closeSequelize()
  await db.end()
  await smtp.stop()
})

describe('a message through the outbox', () => {
  it('arrives once, with one Date, one From and its stored Message-ID, and both parts', async () => {
    const { id, queued } = await queue('headers')
    expect(queued).toBe(true)
    const [mail] = await smtp.waitFor(() => smtp.to(address('headers')).length > 0).then(() => smtp.to(address('headers')))
    const head = mail!.raw.split(/\r?\n\r?\n/)[0]!
    // RFC 5322 §3.6: the origination date and the originator field occur exactly once;
    // §3.6.4: a Message-ID should be there (and at most once).
    expect(head.match(/^Date:/gim)).toHaveLength(1)
    expect(head.match(/^From:/gim)).toHaveLength(1)
    expect(head.match(/^Message-ID:/gim)).toHaveLength(1)
    expect(mail!.parsed.messageId).toBe((await outboxRow(id)).message_id)
    expect(mail!.parsed.from?.value).toEqual([{ name: 'Bloomline', address: 'bloomline@larkspur.example' }])
    // RFC 2046 §5.1.4: multipart/alternative carries the same message as plain text and as HTML.
    expect(mail!.parsed.headers.get('content-type')).toMatchObject({ value: 'multipart/alternative' })
    expect(mail!.parsed.text?.trim()).toBe('Hello headers')
    expect(mail!.parsed.html).toContain('<b>headers</b>')
    expect((await outboxRow(id)).status).toBe('sent')
    // Once sent, a message that may carry a single-use link keeps no copy of it (the link tables hold only hashes).
    const { rows } = await db.query('SELECT html, text FROM mail_outbox WHERE id = $1', [id])
    expect(rows[0]).toEqual({ html: '', text: '(Removed once sent: it held a single-use link.)' })
  })

  it('a weekly status for someone no longer in the organisation is withdrawn at sending time, not sent', async () => {
    const { rows } = await db.query(`SELECT id, email FROM users WHERE email = 'corrie@northfold.example'`)
    const outsider = rows[0] as { id: number, email: string }
    const subject = `Weekly status for an outsider ${run}`
    const { id } = await queueMail({
      organisationId,
      recipientUserId: outsider.id,
      to: outsider.email,
      kind: 'weekly_status',
      periodKey: `mailtest-outsider-${run}`,
      message: { subject, html: '<p>The kennel news</p>', text: 'The kennel news' },
    })
    expect((await until(() => outboxRow(id), row => row.status !== 'pending' && row.status !== 'sending')).status).toBe('cancelled')
    await settle()
    expect(smtp.received.filter(m => m.parsed.subject === subject)).toHaveLength(0)
  })

  it('is written once however often the same key is queued', async () => {
    const first = await queue('twice')
    const second = await queue('twice')
    expect(second).toEqual({ id: first.id, queued: false })
    await smtp.waitFor(() => smtp.to(address('twice')).length > 0)
    await settle()
    expect(smtp.to(address('twice'))).toHaveLength(1)
  })
})

describe('when the SMTP server is down', () => {
  it('waits, is tried again with back-off, and is delivered once when the server is back', async () => {
    await smtp.stop()
    try {
      const { id } = await queue('down')
      const waiting = await until(() => outboxRow(id), row => row.attempts >= 2 && row.status === 'pending')
      expect(waiting.last_error).toMatch(/ECONNREFUSED|connect/i)
      const manager = await signedIn('manager')
      const log = await (await request(manager, '/api/mail/deliveries?status=pending')).json() as DeliveryLogView
      expect(log.deliveries.find(d => d.id === id)).toMatchObject({ status: 'pending', recipientEmail: address('down') })
      expect(log.waitingCount).toBeGreaterThan(0)
    }
    finally {
      await smtp.start()
    }
    await smtp.waitFor(() => smtp.to(address('down')).length > 0)
    await settle()
    expect(smtp.to(address('down'))).toHaveLength(1)
  })

  it('a refusal for now (4xx) is tried again until the server takes it', async () => {
    smtp.behaviour.refuse = true
    const { id } = await queue('busy')
    try {
      await until(() => outboxRow(id), row => row.attempts >= 2)
    }
    finally {
      smtp.behaviour.refuse = false
    }
    await smtp.waitFor(() => smtp.to(address('busy')).length > 0)
    await settle()
    expect(smtp.to(address('busy'))).toHaveLength(1)
    expect((await outboxRow(id)).status).toBe('sent')
  })
})

describe('a message refused for good', () => {
  it('is failed at once (RFC 5321 §4.2.1: a 5yz reply is permanent), shown to managers, and can be tried again', async () => {
    smtp.behaviour.rejectRecipients = [address('refused')]
    const { id } = await queue('refused', 'Refused message')
    const failed = await until(() => outboxRow(id), row => row.status === 'failed')
    expect(failed.attempts).toBe(1)
    expect(failed.last_error).toMatch(/550/)

    const manager = await signedIn('manager')
    const log = await (await request(manager, '/api/mail/deliveries?status=failed')).json() as DeliveryLogView
    expect(log.failedCount).toBeGreaterThan(0)
    expect(log.deliveries.find(d => d.id === id)).toMatchObject({ status: 'failed', subject: 'Refused message' })
    expect(log.deliveries.every(d => d.status === 'failed')).toBe(true)

    smtp.behaviour.rejectRecipients = []
    const retried = await request(manager, `/api/mail/deliveries/${id}/retry`, { method: 'POST' })
    expect(retried.status).toBe(200)
    await smtp.waitFor(() => smtp.to(address('refused')).length > 0)
    expect((await request(manager, `/api/mail/deliveries/${id}/retry`, { method: 'POST' })).status).toBe(409)
  })

  it('the log and the retry are for managers of the organisation only', async () => {
    expect((await request(null, '/api/mail/deliveries')).status).toBe(401)
    expect((await request(await signedIn('handler'), '/api/mail/deliveries')).status).toBe(403)
    expect((await request(await signedIn('assistant'), '/api/mail/deliveries')).status).toBe(403)
    const manager = await signedIn('manager')
    expect((await request(manager, '/api/mail/deliveries?status=lost')).status).toBe(400)
    const { id } = await queue('scoped')
    const other = await signedIn('corrie@northfold.example')
    expect((await request(other, `/api/mail/deliveries/${id}/retry`, { method: 'POST' })).status).toBe(404)
    const theirs = await (await request(other, '/api/mail/deliveries')).json() as DeliveryLogView
    expect(theirs.deliveries.some(d => d.id === id)).toBe(false)
  })
})

describe('two app instances', () => {
  it('send each of many messages exactly once between them', async () => {
    const second = await startInstance(Number(process.env.BLOOMLINE_TEST_PORT) + 7)
    try {
      const names = Array.from({ length: 12 }, (_, i) => `pair${i}`)
      for (const n of names) await queue(n)
      await smtp.waitFor(() => names.every(n => smtp.to(address(n)).length > 0), 45_000)
      await settle()
      for (const n of names) expect(smtp.to(address(n)), n).toHaveLength(1)
    }
    finally {
      await second.stop()
    }
  })
})

describe('the demo mailbox', () => {
  it('keeps what the demo SMTP server receives and shows it to managers', async () => {
    const port = Number(process.env.BLOOMLINE_TEST_PORT) + 8
    const smtpPort = port + 1100
    // Demo mode with no SMTP_HOST starts the in-app server; jobs are off so this instance sends nothing of the tests'.
    const demo = await startInstance(port, { SMTP_HOST: undefined, BLOOMLINE_JOBS: 'off', BLOOMLINE_DEMO_SMTP_PORT: String(smtpPort), NUXT_PUBLIC_DEMO_MODE: 'true' })
    try {
      expect(demo.output()).toContain(`Demo mailbox: SMTP on 127.0.0.1:${smtpPort}`)
      const subject = `Demo mailbox check ${run}`
      await nodemailer.createTransport({ host: '127.0.0.1', port: smtpPort, secure: false, ignoreTLS: true })
        .sendMail({ from: 'Bloomline <bloomline@larkspur.example>', to: 'pip@larkspur.example', subject, text: 'Plain words', html: '<p>HTML words</p>' })
      // A session signed by the first instance works on this fresh one from its very first request
      // (every instance shares NUXT_AUTH_SECRET; nothing of sign-in need have run here yet).
      const fromFirst = await signedIn('manager')
      expect((await fetch(`${demo.url}/api/mailbox`, { headers: { cookie: fromFirst.header() } })).status).toBe(200)
      const manager = await signedInAt(demo.url, 'manager')
      const list = await fetch(`${demo.url}/api/mailbox`, { headers: { cookie: manager.header() } })
      expect(list.status).toBe(200)
      const mails = await list.json() as DemoMailSummary[]
      const mine = mails.find(m => m.subject === subject)
      expect(mine).toMatchObject({ to: 'pip@larkspur.example', from: 'bloomline@larkspur.example' })
      const one = await (await fetch(`${demo.url}/api/mailbox/${mine!.id}`, { headers: { cookie: manager.header() } })).json() as DemoMailView
      expect(one.text?.trim()).toBe('Plain words')
      expect(one.html).toContain('HTML words')
      expect(one.headers.filter(h => h.name === 'date')).toHaveLength(1)
      const handler = await signedInAt(demo.url, 'handler')
      expect((await fetch(`${demo.url}/api/mailbox`, { headers: { cookie: handler.header() } })).status).toBe(403)

      // Each manager reads the mail of their own organisation's people only: Northfold's manager
      // sees what went to her, not Larkspur's assistant's; Larkspur's does not see hers.
      const northfoldSubject = `Northfold mailbox check ${run}`
      await nodemailer.createTransport({ host: '127.0.0.1', port: smtpPort, secure: false, ignoreTLS: true })
        .sendMail({ from: 'Bloomline <bloomline@larkspur.example>', to: 'corrie@northfold.example', subject: northfoldSubject, text: 'For Northfold' })
      const northfold = await signedInAt(demo.url, 'corrie@northfold.example')
      const read = async (jar: typeof manager, path = '') => fetch(`${demo.url}/api/mailbox${path}`, { headers: { cookie: jar.header() } })
      const theirs = await (await read(northfold)).json() as DemoMailSummary[]
      expect(theirs.map(m => m.subject)).toContain(northfoldSubject)
      expect(theirs.map(m => m.subject)).not.toContain(subject)
      expect((await read(northfold, `/${mine!.id}`)).status).toBe(404)
      const ours = await (await read(manager)).json() as DemoMailSummary[]
      expect(ours.map(m => m.subject)).not.toContain(northfoldSubject)
      // A message the outbox sent for Larkspur, to someone of both organisations, is Larkspur's
      // alone: found by its Message-ID (RFC 5322 §3.6.4), it stays out of Northfold's part.
      const sharedSubject = `Larkspur-only weekly check ${run}`
      const messageId = `<mailbox-scope-${run}@larkspur.example>`
      const { rows: [sent] } = await db.query(`INSERT INTO mail_outbox (organisation_id, recipient_email, kind, period_key, subject, html, text, message_id, status)
        VALUES ($1, 'maren@larkspur.example', 'weekly_status', $2, $3, '<p>Larkspur</p>', 'Larkspur', $4, 'sent') RETURNING id`, [organisationId, `mailbox-scope-${run}`, sharedSubject, messageId])
      try {
        await nodemailer.createTransport({ host: '127.0.0.1', port: smtpPort, secure: false, ignoreTLS: true })
          .sendMail({ from: 'Bloomline <bloomline@larkspur.example>', to: 'maren@larkspur.example', subject: sharedSubject, text: 'Larkspur', messageId })
        expect(((await (await read(manager)).json()) as DemoMailSummary[]).map(m => m.subject)).toContain(sharedSubject)
        expect(((await (await read(northfold)).json()) as DemoMailSummary[]).map(m => m.subject)).not.toContain(sharedSubject)
      }
      finally {
        await db.query('DELETE FROM mail_outbox WHERE id = $1', [sent.id])
      }
      // Mail of no organisation goes to members only, never to invitees: inviting an address must
      // not let a manager read that person's password reset (OWASP ASVS 5.0 V6.4, "authentication
      // factor lifecycle and recovery"; from memory).
      const invited = await fetch(`${demo.url}/api/invitations`, { method: 'POST', headers: { 'cookie': northfold.header(), 'content-type': 'application/json' }, body: JSON.stringify({ email: 'pip@larkspur.example', role: 'assistant' }) })
      expect(invited.status).toBe(201)
      const resetSubject = `A reset link for Pip ${run}`
      await nodemailer.createTransport({ host: '127.0.0.1', port: smtpPort, secure: false, ignoreTLS: true })
        .sendMail({ from: 'Bloomline <bloomline@larkspur.example>', to: 'pip@larkspur.example', subject: resetSubject, text: 'Reset' })
      expect(((await (await read(northfold)).json()) as DemoMailSummary[]).map(m => m.subject)).not.toContain(resetSubject)
      expect(((await (await read(manager)).json()) as DemoMailSummary[]).map(m => m.subject)).toContain(resetSubject)
      const { invitation } = await invited.json() as { invitation: { id: number } }
      await fetch(`${demo.url}/api/invitations/${invitation.id}`, { method: 'DELETE', headers: { cookie: northfold.header() } })

      // Emptying removes only what one's own organisation sent: mail to Maren, of both, stays for Larkspur.
      const sharedOutside = `For Maren of both ${run}`
      await nodemailer.createTransport({ host: '127.0.0.1', port: smtpPort, secure: false, ignoreTLS: true })
        .sendMail({ from: 'Bloomline <bloomline@larkspur.example>', to: 'maren@larkspur.example', subject: sharedOutside, text: 'Both' })
      expect(((await (await read(northfold)).json()) as DemoMailSummary[]).map(m => m.subject)).toContain(sharedOutside)
      expect((await fetch(`${demo.url}/api/mailbox`, { method: 'DELETE', headers: { cookie: northfold.header() } })).status).toBe(200)
      const larkspurAfter = ((await (await read(manager)).json()) as DemoMailSummary[]).map(m => m.subject)
      expect(larkspurAfter).toEqual(expect.arrayContaining([subject, sharedOutside]))
    }
    finally {
      await demo.stop()
    }
  })
})
