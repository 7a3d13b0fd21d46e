import { dogPatchSchema } from '../../../shared/schemas/kennel'
import type { DogView } from '../../../shared/types/kennel'

/** Changes a dog's record: managers any field, the dog's own handler its notes only. */
export default defineEventHandler(async (event): Promise<DogView> => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  const id = await readRecordId(event, 'dog')
  const patch = await readKennelBody(event, dogPatchSchema)
  const record = await requireDogRecord(caller, id)
  if (!mayEditDog(caller, record)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Only managers, and the dog\'s own handler for its notes, may change a dog.' })
  }
  if (caller.role !== 'manager' && Object.keys(patch).some(k => k !== 'notes')) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'A handler may change a dog\'s notes only; ask a manager for the rest.' })
  }
  await checkDogFields(caller, patch)
  const { Dog, sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const dog = (await Dog.findOne({ where: { id, organisationId: caller.organisationId }, transaction, lock: transaction.LOCK.UPDATE }))!
    const before = auditSnapshot(dog)
    await uniquely(() => dog.update(patch, { transaction }), 'Another dog of this organisation has that registration number.')
    await recordAudit(caller, 'dog', id, 'update', { before, after: auditSnapshot(dog) }, transaction)
  })
  return (await requireDogView(caller, id)).view
})
