import { AUDIT_PERSON_FIELDS, type AuditEventView } from '../../../../shared/types/kennel'

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
  // The names of the people the rows name by id (who did the work, who has the task, the
  // handler), so the page can say "gave it to Pip" without a member list an assistant may not read.
  const personIds = (r: (typeof rows)[number]) => [r.before, r.after].flatMap(side => AUDIT_PERSON_FIELDS.map(field => side?.[field]).filter((v): v is number => typeof v === 'number'))
  const ids = [...new Set(rows.flatMap(personIds))]
  const names = ids.length
    ? new Map((await selectRows<{ id: number, name: string }>(kennelSequelize(), 'SELECT id, name FROM users WHERE id IN (:ids)', { ids })).map(u => [u.id, u.name]))
    : new Map<number, string>()
  const peopleOf = (r: (typeof rows)[number]) => Object.fromEntries(personIds(r).filter(id => names.has(id)).map(id => [id, names.get(id)!]))
  return rows.map(r => ({
    id: Number(r.id),
    people: peopleOf(r),
    entity: r.entity,
    entityId: r.entityId,
    action: r.action,
    actor: r.actorId === null ? null : { id: r.actorId, name: r.actorName ?? '' },
    at: new Date(r.at).toISOString(),
    before: r.before,
    after: r.after,
  }))
})
