import { workCreateSchema } from '../../../../shared/schemas/kennel'
import type { CoatWorkLogItem } from '../../../../shared/types/kennel'

/** Logs coat work on one or more regions of a dog the caller may see; the caller is its author. */
export default defineEventHandler(async (event): Promise<CoatWorkLogItem> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'dog')
  const body = await readKennelBody(event, workCreateSchema)
  const dog = await requireDogRecord(caller, id)
  await checkWorkFields(caller, dog, body)
  const { CoatWorkRow, sequelize } = useModels()
  const workId = await sequelize.transaction(async (transaction) => {
    const work = await CoatWorkRow.create({
      organisationId: caller.organisationId,
      dogId: id,
      date: body.date,
      kind: body.kind as CoatWorkLogItem['kind'],
      regions: [...new Set(body.regions)],
      workedById: body.workedById ?? caller.userId,
      recordedById: caller.userId,
      minutes: body.minutes ?? null,
      notes: body.notes ?? null,
      taskId: null,
      deletedById: null,
    }, { transaction })
    await recordAudit(caller, 'coat_work', work.id, 'create', { after: auditSnapshot(work) }, transaction)
    return work.id
  })
  const [row] = await loadWorkRecords({ sql: 'w.id = :workId', replacements: { workId } })
  setResponseStatus(event, 201)
  return coatWorkView(caller, row!)
})
