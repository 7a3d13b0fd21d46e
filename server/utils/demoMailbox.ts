import { QueryTypes } from 'sequelize'
import type { Caller } from './auth'
import { kennelSequelize } from './kennel'

// The demo mailbox holds every message the demo's SMTP server took in, for all organisations.
// A manager reads only those addressed to someone of their active organisation: a member, or an
// address it has invited. A manager of another demo organisation does not read them.
const IN_SCOPE = `EXISTS (
  SELECT 1 FROM unnest(string_to_array(d.envelope_to, ', ')) AS rcpt(address)
  WHERE lower(rcpt.address) IN (
    SELECT lower(u.email) FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.organisation_id = :organisationId
    UNION SELECT lower(i.email) FROM invitations i WHERE i.organisation_id = :organisationId))`

/** The ids of the demo mailbox's messages the manager may read, newest first (at most `limit`), or only `id` when given. */
export async function demoMailIdsFor(caller: Pick<Caller, 'organisationId'>, options: { id?: number, limit?: number } = {}): Promise<number[]> {
  const rows = await kennelSequelize().query<{ id: string }>(
    `SELECT d.id FROM demo_mailbox d WHERE ${IN_SCOPE} ${options.id === undefined ? '' : 'AND d.id = :id'} ORDER BY d.id DESC LIMIT :limit`,
    { type: QueryTypes.SELECT, replacements: { organisationId: caller.organisationId, id: options.id ?? null, limit: options.limit ?? 200 } },
  )
  return rows.map(r => Number(r.id))
}
