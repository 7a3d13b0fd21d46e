import { QueryTypes } from 'sequelize'
import type { Caller } from './auth'
import { kennelSequelize } from './kennel'

// The demo mailbox holds every message the demo's SMTP server took in, for all organisations.
// A manager reads a message Bloomline sent for their active organisation (found by its
// Message-ID in the outbox), and one sent for no organisation (a password reset) or from
// outside the outbox when it is addressed to one of their members. Invitees do not count: a
// manager could invite any address and then read its reset link. A weekly status from another
// organisation stays out even when its reader belongs to both.
const TO_OUR_MEMBERS = `EXISTS (
  SELECT 1 FROM unnest(string_to_array(d.envelope_to, ', ')) AS rcpt(address)
  WHERE lower(rcpt.address) IN (
    SELECT lower(u.email) FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.organisation_id = :organisationId))`
const IN_SCOPE = `CASE WHEN o.organisation_id IS NOT NULL THEN o.organisation_id = :organisationId ELSE ${TO_OUR_MEMBERS} END`
// What a manager may remove: only their own organisation's mail, never what a person of two organisations shares.
const OWN = 'o.organisation_id = :organisationId'
// The outbox row of a stored message, by the Message-ID header the outbox gave it (RFC 5322 §3.6.4).
const OUTBOX_ROW = `LEFT JOIN LATERAL (
  SELECT x.organisation_id FROM mail_outbox x
  WHERE x.message_id = substring(d.raw from '(?i)(?:^|\\n)message-id:[ \\t]*(<[^>\\s]+>)') LIMIT 1) o ON true`

/**
 * The ids of the demo mailbox's messages the manager may read, newest first (at most `limit`),
 * or only `id` when given; with `own`, only those their organisation sent, which they may remove.
 */
export async function demoMailIdsFor(caller: Pick<Caller, 'organisationId'>, options: { id?: number, limit?: number, own?: boolean } = {}): Promise<number[]> {
  const rows = await kennelSequelize().query<{ id: string }>(
    `SELECT d.id FROM demo_mailbox d ${OUTBOX_ROW} WHERE ${options.own ? OWN : IN_SCOPE} ${options.id === undefined ? '' : 'AND d.id = :id'} ORDER BY d.id DESC LIMIT :limit`,
    { type: QueryTypes.SELECT, replacements: { organisationId: caller.organisationId, id: options.id ?? null, limit: options.limit ?? 200 } },
  )
  return rows.map(r => Number(r.id))
}
