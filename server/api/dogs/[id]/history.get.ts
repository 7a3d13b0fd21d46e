import type { AuditEventView } from '../../../../shared/types/kennel'

/** The recorded changes to a dog's coat work (and, for managers and handlers, to its record and its tasks), newest first. */
export default defineEventHandler(async (event): Promise<AuditEventView[]> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'dog')
  await requireDogRecord(caller, id)
  const rows = await selectRows<{ id: string, entity: string, entityId: number, action: AuditEventView['action'], actorId: number | null, actorName: string | null, at: Date, before: AuditEventView['before'], after: AuditEventView['after'] }>(kennelSequelize(),
    `SELECT a.id, a.entity, a.entity_id AS "entityId", a.action, a.actor_id AS "actorId", u.name AS "actorName", a.created_at AS at, a.before, a.after
     FROM audit_events a LEFT JOIN users u ON u.id = a.actor_id
     WHERE a.organisation_id = :organisationId AND (
       (a.entity = 'coat_work' AND (a.before->>'dogId' = :dogKey OR a.after->>'dogId' = :dogKey))
       OR (:withDog AND a.entity = 'dog' AND a.entity_id = :dogId)
       OR (:withDog AND a.entity = 'task' AND (a.before->>'dogId' = :dogKey OR a.after->>'dogId' = :dogKey)))
     ORDER BY a.id DESC LIMIT 500`,
    { organisationId: caller.organisationId, dogKey: String(id), dogId: id, withDog: caller.role !== 'assistant' })
  return rows.map(r => ({
    id: Number(r.id),
    entity: r.entity,
    entityId: r.entityId,
    action: r.action,
    actor: r.actorId === null ? null : { id: r.actorId, name: r.actorName ?? '' },
    at: new Date(r.at).toISOString(),
    before: r.before,
    after: r.after,
  }))
})
