import { readinessQuerySchema } from '../../../../shared/schemas/kennel'
import type { ReadinessView, ShowRef } from '../../../../shared/types/kennel'

/**
 * A dog's readiness, computed now from its stored work: for `?show=` (its first day), for
 * `?date=` (a what-if; with `?show=` too, that show moved to the date), or by default for the
 * dog's next show with a live entry, or today when it has none.
 */
export default defineEventHandler(async (event): Promise<ReadinessView> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'dog')
  const query = await readKennelQuery(event, readinessQuerySchema)
  const today = callerToday(caller)
  const dog = await requireDogRecord(caller, id, today)
  const sequelize = kennelSequelize()
  let show: ShowRef | null = null
  if (query.show !== undefined) {
    // Anyone but a manager reaches only the shows this dog is entered in.
    const [found] = query.show > MAX_ROW_ID
      ? []
      : await selectRows<ShowRef>(sequelize,
          `SELECT s.id, s.name, s.first_day AS "firstDay" FROM shows s WHERE s.id = :show AND s.organisation_id = :organisationId
           AND (:manager OR EXISTS (SELECT 1 FROM entries e WHERE e.show_id = s.id AND e.dog_id = :dogId))`,
          { show: query.show, organisationId: caller.organisationId, manager: caller.role === 'manager', dogId: id })
    if (!found) throw notFound('show')
    show = found
  }
  else if (query.date === undefined) {
    show = (await loadLiveShows(sequelize, { sql: 'SELECT CAST(:dogId AS int)', replacements: { dogId: id } }, today, true)).get(id)?.[0] ?? null
  }
  const showDate = query.date ?? show?.firstDay ?? today
  const profile = (await findProfile(caller, dog.coatProfileId))!
  return { dogId: id, show, showDate, readiness: readinessFor(profile, await loadDogPulls(id), showDate), regions: regionRefs(profile) }
})
