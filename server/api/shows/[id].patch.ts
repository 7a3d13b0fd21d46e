import { showPatchSchema } from '../../../shared/schemas/kennel'
import type { ShowView } from '../../../shared/types/kennel'

/**
 * Changes a show. Managers only. Entries close keeps its wall-clock date and time when only the
 * time zone changes (a schedule's "closes 23:59" stays 23:59 there); `entriesCloseDate: null` clears it.
 */
export default defineEventHandler(async (event): Promise<ShowView> => {
  const caller = await requireCaller(event, ['manager'])
  const id = await readRecordId(event, 'show')
  const { entriesCloseDate, entriesCloseTime, ...patch } = await readKennelBody(event, showPatchSchema)
  const { Show, sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const show = await Show.findOne({ where: { id, organisationId: caller.organisationId }, transaction, lock: transaction.LOCK.UPDATE })
    if (!show) throw notFound('show')
    const firstDay = patch.firstDay ?? show.firstDay
    checkShowDays(firstDay, patch.lastDay ?? show.lastDay)
    const timeZone = patch.timeZone ?? show.timeZone
    const current = show.entriesCloseAt ? instantToWallClock(show.entriesCloseAt, show.timeZone) : null
    const entriesCloseAt = entriesCloseDate === null
      ? null
      : entriesCloseInstant(entriesCloseDate ?? current?.date, entriesCloseTime ?? current?.time, timeZone, firstDay)
    const before = auditSnapshot(show)
    await uniquely(
      () => show.update({ ...patch, entriesCloseAt }, { transaction }),
      `There is already a show called "${patch.name ?? show.name}" starting ${firstDay}.`,
    )
    await recordAudit(caller, 'show', id, 'update', { before, after: auditSnapshot(show) }, transaction)
  })
  return requireShowView(caller, id)
})
