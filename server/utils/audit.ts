import type { Model, Transaction } from 'sequelize'
import { AuditEvent } from '../database/models'

/** The record kinds the audit trail names. */
export type AuditEntity = 'dog' | 'coat_work' | 'show' | 'entry' | 'coat_profile' | 'task'

/** A model row as plain data for the audit trail (dates become ISO 8601 strings in JSONB). */
export function auditSnapshot(row: Model): Record<string, unknown> {
  return JSON.parse(JSON.stringify(row.get({ plain: true })))
}

/** Writes one audit row: who changed which record, and the record before and after. */
export async function recordAudit(
  caller: { userId: number, organisationId: number },
  entity: AuditEntity,
  entityId: number,
  action: AuditEvent['action'],
  change: { before?: object | null, after?: object | null },
  transaction?: Transaction,
): Promise<void> {
  await AuditEvent.create({
    organisationId: caller.organisationId,
    actorId: caller.userId,
    entity,
    entityId,
    action,
    before: change.before ?? null,
    after: change.after ?? null,
  }, { transaction })
}
