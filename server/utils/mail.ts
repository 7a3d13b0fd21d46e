import { randomUUID } from 'node:crypto'
import nodemailer, { type Transporter } from 'nodemailer'
import { Sequelize, type Transaction } from 'sequelize'
import { getSequelize } from '../database/connection'
import type { MailKind } from '../../shared/types/mail'
import { jobTuning, sendJob } from './jobs'

// Explicit imports only: scripts and tests load these helpers outside Nitro.

/** A rendered message: both parts, and any extra headers (List-Unsubscribe and the like). */
export interface MailMessage {
  subject: string
  html: string
  text: string
  headers?: Record<string, string>
}

/** What to put in the outbox: the key (organisation, recipient, kind, period) and the message. */
export interface QueueMailInput {
  organisationId: number | null
  recipientUserId: number | null
  to: string
  toName?: string | null
  kind: MailKind
  /** The ISO week (`2026-W49`) for a weekly status; the invitation or reset and its sending for the others. */
  periodKey: string
  message: MailMessage
}

export const MAIL_SEND_QUEUE = 'mail-send'

interface SmtpSettings {
  host: string
  port: number
  user?: string
  password?: string
  tls: 'implicit' | 'required' | 'opportunistic' | 'off'
}

let demoSmtpPort: number | null = null
let transporter: { key: string, transport: Transporter } | undefined

/** Points the sender at the demo's own SMTP server (demo mode, no SMTP_HOST configured). */
export function useDemoSmtp(port: number) {
  demoSmtpPort = port
}

/** The SMTP settings from the environment: SMTP_HOST, SMTP_PORT, SMTP_USER, SMTP_PASSWORD, SMTP_TLS. */
export function smtpSettings(env = process.env): SmtpSettings | null {
  const tls = (env.SMTP_TLS ?? 'opportunistic') as SmtpSettings['tls']
  if (!['implicit', 'required', 'opportunistic', 'off'].includes(tls)) {
    throw new Error(`SMTP_TLS must be implicit, required, opportunistic or off, not "${env.SMTP_TLS}".`)
  }
  if (env.SMTP_HOST) {
    return { host: env.SMTP_HOST, port: Number(env.SMTP_PORT || (tls === 'implicit' ? 465 : 587)), user: env.SMTP_USER || undefined, password: env.SMTP_PASSWORD || undefined, tls }
  }
  if (demoSmtpPort) return { host: '127.0.0.1', port: demoSmtpPort, tls: 'off' }
  return null
}

/** The From address of every message (MAIL_FROM), e.g. `Bloomline <bloomline@kennel.example>`. */
export function mailFrom(env = process.env): string {
  return env.MAIL_FROM || 'Bloomline <bloomline@localhost>'
}

/** The absolute address of a page of the app, for links in messages. */
export function appUrl(path: string, env = process.env): string {
  const base = env.BLOOMLINE_PUBLIC_URL || (env.AUTH_ORIGIN ?? `http://localhost:${env.PORT ?? 3000}/api/auth`).replace(/\/api\/auth\/?$/, '')
  return new URL(path, base.endsWith('/') ? base : `${base}/`).toString()
}

function transport(settings: SmtpSettings): Transporter {
  const key = JSON.stringify(settings)
  if (transporter?.key === key) return transporter.transport
  transporter?.transport.close()
  const timeouts = Math.max(5, Math.floor(jobTuning().mailExpireSeconds / 3)) * 1000
  const transport = nodemailer.createTransport({
    host: settings.host,
    port: settings.port,
    secure: settings.tls === 'implicit',
    requireTLS: settings.tls === 'required',
    ignoreTLS: settings.tls === 'off',
    auth: settings.user ? { user: settings.user, pass: settings.password ?? '' } : undefined,
    // Bounded, so a hung server cannot hold a message past its lock (see deliverOutbox).
    connectionTimeout: timeouts,
    greetingTimeout: timeouts,
    socketTimeout: timeouts,
  })
  transporter = { key, transport }
  return transport
}

function domainOf(from: string): string {
  return /@([^>\s]+)>?\s*$/.exec(from)?.[1] ?? 'localhost'
}

function currentTransaction(): Transaction | undefined {
  // Sequelize keeps the transaction of `sequelize.transaction(async () => …)` in its CLS namespace.
  return (Sequelize as unknown as { _cls?: { get(key: string): Transaction | undefined } })._cls?.get('transaction')
}

/**
 * Writes a message to the outbox and asks a worker to send it. The key (organisation,
 * recipient, kind, period) makes it one of a kind: queueing the same key again writes nothing and
 * returns the message already there with `queued: false`. Inside a transaction the job is asked
 * for only once the transaction has committed, so a worker never looks for a row it cannot see.
 */
export async function queueMail(input: QueueMailInput): Promise<{ id: number, queued: boolean }> {
  const sequelize = getSequelize()
  const messageId = `<${randomUUID()}@${domainOf(mailFrom())}>`
  const [inserted] = await sequelize.query(
    `INSERT INTO mail_outbox (organisation_id, recipient_user_id, recipient_email, recipient_name, kind, period_key, subject, html, text, headers, message_id)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11)
     ON CONFLICT DO NOTHING RETURNING id`,
    { bind: [input.organisationId, input.recipientUserId, input.to, input.toName ?? null, input.kind, input.periodKey, input.message.subject, input.message.html, input.message.text, JSON.stringify(input.message.headers ?? {}), messageId] },
  ) as [{ id: string }[], unknown]
  if (!inserted.length) {
    const [existing] = await sequelize.query(
      `SELECT id FROM mail_outbox WHERE COALESCE(organisation_id, 0) = COALESCE($1::int, 0) AND lower(recipient_email) = lower($2) AND kind = $3 AND period_key = $4`,
      { bind: [input.organisationId, input.to, input.kind, input.periodKey] },
    ) as [{ id: string }[], unknown]
    return { id: Number(existing[0]!.id), queued: false }
  }
  const id = Number(inserted[0]!.id)
  const transaction = currentTransaction()
  if (transaction) transaction.afterCommit(() => askToSend(id))
  else await askToSend(id)
  return { id, queued: true }
}

/**
 * Withdraws messages not yet sent: when a link they carry stops working (an invitation resent or
 * revoked, a newer password reset), so no dead link is delivered later. A send already under way
 * may still finish (and is then logged as sent); a failed one is not tried again. Matches the kind and organisation, and the recipient or a period-key prefix.
 */
export async function cancelWaitingMail(match: { organisationId: number | null, kind: MailKind, recipientEmail?: string, periodKeyPrefix?: string }): Promise<number> {
  const [, result] = await getSequelize().query(
    `UPDATE mail_outbox SET status = 'cancelled', ${FORGET_LINK_BODY}, updated_at = now()
     WHERE status IN ('pending', 'sending') AND kind = $1 AND COALESCE(organisation_id, 0) = COALESCE($2::int, 0)
       AND ($3::text IS NULL OR lower(recipient_email) = lower($3))
       AND ($4::text IS NULL OR starts_with(period_key, $4))`,
    { bind: [match.kind, match.organisationId, match.recipientEmail ?? null, match.periodKeyPrefix ?? null] },
  ) as [unknown, { rowCount?: number }]
  return result?.rowCount ?? 0
}

/** Asks a worker to send an outbox message, now or after `delaySeconds`; a failure to ask is left to the sweep. */
export async function askToSend(id: number, delaySeconds = 0) {
  try {
    await sendJob(MAIL_SEND_QUEUE, { outboxId: id }, { singletonKey: `outbox-${id}`, startAfter: delaySeconds })
  }
  catch (error) {
    console.warn(`Outbox message ${id} waits for the next sweep: ${(error as Error).message}`)
  }
}

interface ClaimedRow {
  id: string
  organisation_id: number | null
  recipient_user_id: number | null
  kind: MailKind
  recipient_email: string
  recipient_name: string | null
  subject: string
  html: string
  text: string
  headers: Record<string, string>
  message_id: string
  attempts: number
  claim_token: string
}

// A sent or withdrawn message that carried a single-use link keeps no copy of it: the tables of
// invitations and resets store only the link's hash, and the outbox must not undo that.
const FORGET_LINK_BODY = `html = CASE WHEN kind IN ('invitation', 'password_reset') THEN '' ELSE html END,
  text = CASE WHEN kind IN ('invitation', 'password_reset') THEN '(Removed once sent: it held a single-use link.)' ELSE text END`

/** Seconds to wait before the next try after `attempts` failed ones: doubling, at most an hour. */
export function retryDelaySeconds(attempts: number, base = jobTuning().mailRetrySeconds): number {
  return Math.min(3600, base * 2 ** Math.max(0, attempts - 1))
}

/** Whether an SMTP failure is for good (a 5xx reply), so retrying cannot help. */
function isPermanent(error: unknown): boolean {
  const code = (error as { responseCode?: number }).responseCode
  return typeof code === 'number' && code >= 500 && code < 600
}

/**
 * Sends one outbox message, once. The row is claimed with a lock as long as the job's expiry, so
 * a second worker, a retried job or a restarted instance finds it taken or sent and sends nothing.
 * A failure puts it back to wait, with a doubling delay, until the last try marks it failed.
 * Returns what happened, for the worker's log and the tests.
 */
export async function deliverOutbox(id: number): Promise<'sent' | 'retry' | 'failed' | 'skipped' | 'locked' | 'withdrawn'> {
  const sequelize = getSequelize()
  const tuning = jobTuning()
  const [claimed] = await sequelize.query(
    `UPDATE mail_outbox SET status = 'sending', attempts = attempts + 1, claim_token = gen_random_uuid(),
       locked_until = now() + make_interval(secs => $2), updated_at = now()
     WHERE id = $1 AND ((status = 'pending' AND next_attempt_at <= now() + interval '2 seconds') OR (status = 'sending' AND locked_until < now()))
     RETURNING id, organisation_id, recipient_user_id, kind, recipient_email, recipient_name, subject, html, text, headers, message_id, attempts, claim_token`,
    { bind: [id, tuning.mailLockSeconds] },
  ) as [ClaimedRow[], unknown]
  const row = claimed[0]
  if (!row) {
    const [state] = await sequelize.query(`SELECT status FROM mail_outbox WHERE id = $1`, { bind: [id] }) as [{ status: string }[], unknown]
    // Held by a worker that may have died, or waiting for its time: the job is tried again later.
    if (state[0]?.status === 'sending' || state[0]?.status === 'pending') return 'locked'
    return 'skipped'
  }
  // Only this claim may record the outcome; a row withdrawn meanwhile stays withdrawn.
  const finish = (sets: string, bind: unknown[]) => sequelize.query(
    `UPDATE mail_outbox SET ${sets}, locked_until = NULL, claim_token = NULL, updated_at = now() WHERE id = $1 AND claim_token = $2 AND status = 'sending'`,
    { bind: [id, row.claim_token, ...bind] },
  ) as Promise<[unknown, { rowCount?: number }]>
  if (row.kind === 'weekly_status' && row.recipient_user_id && row.organisation_id && !await stillWantsWeekly(row.recipient_user_id, row.organisation_id)) {
    // Removed from the organisation or unsubscribed since it was queued: the kennel's news is no longer theirs.
    await finish(`status = 'cancelled'`, [])
    return 'withdrawn'
  }
  const settings = smtpSettings()
  try {
    if (!settings) throw new Error('No SMTP server is configured (set SMTP_HOST).')
    await transport(settings).sendMail({
      from: mailFrom(),
      to: row.recipient_name ? { name: row.recipient_name, address: row.recipient_email } : row.recipient_email,
      subject: row.subject,
      html: row.html,
      text: row.text,
      headers: row.headers,
      messageId: row.message_id,
    })
  }
  catch (error) {
    const message = (error as Error).message.slice(0, 1000)
    const last = isPermanent(error) || row.attempts >= tuning.mailMaxAttempts
    const delay = retryDelaySeconds(row.attempts)
    const [, result] = await finish(`status = $3, last_error = $4, next_attempt_at = now() + make_interval(secs => $5)`, [last ? 'failed' : 'pending', message, delay])
    if (!result?.rowCount) return 'skipped'
    if (last) return 'failed'
    await askToSend(id, delay)
    return 'retry'
  }
  await finish(`status = 'sent', sent_at = now(), last_error = NULL, ${FORGET_LINK_BODY}`, [])
  return 'sent'
}

async function stillWantsWeekly(userId: number, organisationId: number): Promise<boolean> {
  const [rows] = await getSequelize().query(
    `SELECT 1 FROM memberships m WHERE m.user_id = $1 AND m.organisation_id = $2
       AND NOT EXISTS (SELECT 1 FROM mail_unsubscribes u WHERE u.user_id = $1 AND u.organisation_id = $2 AND u.kind = 'weekly_status')`,
    { bind: [userId, organisationId] },
  ) as [unknown[], unknown]
  return rows.length > 0
}

/** Asks again for every message that waits past its time or whose worker died; nothing is lost. */
export async function sweepOutbox(): Promise<number> {
  const [rows] = await getSequelize().query(
    `SELECT id FROM mail_outbox
     WHERE (status = 'pending' AND next_attempt_at <= now()) OR (status = 'sending' AND locked_until < now())
     ORDER BY next_attempt_at LIMIT 500`,
  ) as [{ id: string }[], unknown]
  for (const { id } of rows) await askToSend(Number(id))
  return rows.length
}
