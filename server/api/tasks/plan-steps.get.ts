import { COAT_CAUTIONS } from '../../../shared/coat'
import { planStepsQuerySchema } from '../../../shared/schemas/tasks'
import type { PlanStepsView } from '../../../shared/types/tasks'

/** A dog's plan steps for the coming weeks (or `from`–`to`), each saying which task was already made from it. */
export default defineEventHandler(async (event): Promise<PlanStepsView> => {
  const caller = await requireCaller(event)
  const query = await readKennelQuery(event, planStepsQuerySchema)
  const today = callerToday(caller)
  const dog = await requireDogRecord(caller, query.dog, today)
  const range = planRange(today, query.from, query.to)
  const steps = await planOffers(caller, dog, range, today)
  return { dogId: dog.id, today, ...range, steps, cautions: COAT_CAUTIONS }
})
