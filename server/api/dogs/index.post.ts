import { dogCreateSchema } from '../../../shared/schemas/kennel'
import type { DogView } from '../../../shared/types/kennel'

/** Adds a dog. Managers only; with no coat profile named it gets the organisation's default. */
export default defineEventHandler(async (event): Promise<DogView> => {
  const caller = await requireCaller(event, ['manager'])
  const body = await readKennelBody(event, dogCreateSchema)
  await checkDogFields(caller, body)
  const coatProfileId = body.coatProfileId ?? await ensureDefaultProfile(caller.organisationId)
  const { Dog, sequelize } = useModels()
  const id = await sequelize.transaction(async (transaction) => {
    const dog = await uniquely(
      () => Dog.create({ ...body, coatProfileId, organisationId: caller.organisationId }, { transaction }),
      'Another dog of this organisation has that registration number.',
    )
    await recordAudit(caller, 'dog', dog.id, 'create', { after: auditSnapshot(dog) }, transaction)
    return dog.id
  })
  setResponseStatus(event, 201)
  return (await requireDogView(caller, id)).view
})
