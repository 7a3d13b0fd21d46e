import { entryCreateSchema } from '../../../shared/schemas/kennel'
import type { EntryView } from '../../../shared/types/kennel'

/** Enters a dog in a class at a show. Managers only; the handler defaults to the dog's. One entry per show, dog and class (409). */
export default defineEventHandler(async (event): Promise<EntryView> => {
  const caller = await requireCaller(event, ['manager'])
  const body = await readKennelBody(event, entryCreateSchema)
  checkClassCode(caller, body.classCode)
  const { Dog, Show, Entry, sequelize } = useModels()
  const where = (id: number) => ({ id: Math.min(id, MAX_ROW_ID + 1), organisationId: caller.organisationId })
  const [dog, show] = await Promise.all([Dog.findOne({ where: where(body.dogId) }), Show.findOne({ where: where(body.showId) })])
  if (!dog) throw invalidField('dogId', 'No such dog in this organisation')
  if (!show) throw invalidField('showId', 'No such show in this organisation')
  if (body.handlerId != null) await requireMember(caller, body.handlerId, 'handlerId')
  const id = await sequelize.transaction(async (transaction) => {
    const entry = await uniquely(
      () => Entry.create({
        organisationId: caller.organisationId,
        dogId: dog.id,
        showId: show.id,
        classCode: body.classCode,
        armband: body.armband ?? null,
        status: body.status ?? 'planned',
        handlerId: body.handlerId === undefined ? dog.handlerId : body.handlerId,
        notes: body.notes ?? null,
      }, { transaction }),
      `${dog.callName} is already entered in ${classDefinition(callerRuleSet(caller), body.classCode)!.label} at ${show.name}; change that entry instead.`,
    )
    await recordAudit(caller, 'entry', entry.id, 'create', { after: auditSnapshot(entry) }, transaction)
    return entry.id
  })
  setResponseStatus(event, 201)
  return requireEntryView(caller, id)
})
