/** The organisation's weekly-status settings and where this week stands (managers). */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  return weeklySettingsView(await callerWeeklyOrganisation(caller))
})
