import type { DogView } from '../../../shared/types/kennel'

/** One dog the caller may see, with its profile, next show and readiness; assistants get no owner contact. */
export default defineEventHandler(async (event): Promise<DogView> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'dog')
  return (await requireDogView(caller, id)).view
})
