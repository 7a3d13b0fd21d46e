import { planWorkBack } from '../../../../shared/coat'

/** A dog's work-back plan as a one-off .ics download, scoped like GET /api/dogs/[id]/plan. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'dog')
  const today = callerToday(caller)
  const dog = await requireDogRecord(caller, id, today)
  const [profile, pulls, shows] = await Promise.all([
    findProfile(caller, dog.coatProfileId),
    loadDogPulls(id),
    loadLiveShows(kennelSequelize(), { sql: 'SELECT CAST(:dogId AS int)', replacements: { dogId: id } }, today).then(m => m.get(id) ?? []),
  ])
  const plan = planWorkBack(profile!, pulls.filter(w => w.date <= today), shows.map(s => s.firstDay), today)
  const cal = newCalendar(`Bloomline — ${dog.callName}'s plan`)
  addPlanEvents(cal, dog, plan.steps, profile ?? undefined)
  const file = `${dog.callName.replace(/[^A-Za-z0-9-]+/g, '-').replace(/^-|-$/g, '') || 'dog'}-plan.ics`
  return sendCalendar(event, cal, file)
})
