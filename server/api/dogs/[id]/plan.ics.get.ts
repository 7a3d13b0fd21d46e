/** A dog's work-back plan as a one-off .ics download, scoped like GET /api/dogs/[id]/plan. */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'dog')
  const { dog, plan, profile } = await loadDogPlan(caller, id)
  const cal = newCalendar(`Bloomline — ${dog.callName}'s plan`)
  addPlanEvents(cal, dog, plan.steps, profile)
  const file = `${dog.callName.replace(/[^A-Za-z0-9-]+/g, '-').replace(/^-|-$/g, '') || 'dog'}-plan.ics`
  return sendCalendar(event, cal, file)
})
