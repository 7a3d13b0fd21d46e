import { COAT_CAUTIONS } from '../../../../shared/coat'
import type { PlanView } from '../../../../shared/types/kennel'

/** A dog's work-back plan for every show it has a live entry in from today, computed now from its stored work. */
export default defineEventHandler(async (event): Promise<PlanView> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'dog')
  const { today, shows, plan, profile } = await loadDogPlan(caller, id)
  return { dogId: id, today, shows, plan, regions: regionRefs(profile), cautions: COAT_CAUTIONS }
})
