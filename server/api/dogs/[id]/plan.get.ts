import { COAT_CAUTIONS, planWorkBack } from '../../../../shared/coat'
import type { PlanView } from '../../../../shared/types/kennel'

/** A dog's work-back plan for every show it has a live entry in from today, computed now from its stored work. */
export default defineEventHandler(async (event): Promise<PlanView> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'dog')
  const today = callerToday(caller)
  const dog = await requireDogRecord(caller, id, today)
  const [profile, pulls, shows] = await Promise.all([
    findProfile(caller, dog.coatProfileId),
    loadDogPulls(id),
    loadLiveShows(kennelSequelize(), { sql: 'SELECT CAST(:dogId AS int)', replacements: { dogId: id } }, today).then(m => m.get(id) ?? []),
  ])
  // The plan starts from work already done; a pull dated after today (a clock change) waits for its day.
  const done = pulls.filter(w => w.date <= today)
  const plan = planWorkBack(profile!, done, shows.map(s => s.firstDay), today)
  return { dogId: id, today, shows, plan, regions: regionRefs(profile!), cautions: COAT_CAUTIONS }
})
