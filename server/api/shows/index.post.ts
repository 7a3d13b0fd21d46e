import { showCreateSchema } from '../../../shared/schemas/kennel'
import type { ShowView } from '../../../shared/types/kennel'

/** Adds a show. Managers only; entries close as a date and HH:mm on the show's wall clock, in its time zone (the organisation's by default). */
export default defineEventHandler(async (event): Promise<ShowView> => {
  const caller = await requireCaller(event, ['manager'])
  const { entriesCloseDate, entriesCloseTime, ...body } = await readKennelBody(event, showCreateSchema)
  const timeZone = body.timeZone ?? caller.timeZone
  const entriesCloseAt = entriesCloseInstant(entriesCloseDate, entriesCloseTime, timeZone, body.firstDay)
  const { Show, sequelize } = useModels()
  const id = await sequelize.transaction(async (transaction) => {
    const show = await uniquely(
      () => Show.create({ ...body, judges: body.judges ?? [], timeZone, entriesCloseAt, organisationId: caller.organisationId }, { transaction }),
      `There is already a show called "${body.name}" starting ${body.firstDay}.`,
    )
    await recordAudit(caller, 'show', show.id, 'create', { after: auditSnapshot(show) }, transaction)
    return show.id
  })
  setResponseStatus(event, 201)
  return requireShowView(caller, id)
})
