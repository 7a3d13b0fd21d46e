import { weeklySettingsPatchSchema } from '../../../shared/schemas/weekly'

/** Changes the weekly status's day, hour, on/off and whether assistants get it (managers). */
export default defineEventHandler(async (event) => {
  const caller = await requireCaller(event, ['manager'])
  const patch = await readBodyWith(event, weeklySettingsPatchSchema)
  const { Organisation } = useModels()
  const row = await Organisation.findByPk(caller.organisationId)
  if (!row) throw notFound('organisation')
  await row.update({
    ...(patch.day !== undefined ? { weeklyDay: patch.day } : {}),
    ...(patch.hour !== undefined ? { weeklyHour: patch.hour } : {}),
    ...(patch.enabled !== undefined ? { weeklyEnabled: patch.enabled } : {}),
    ...(patch.toAssistants !== undefined ? { weeklyToAssistants: patch.toAssistants } : {}),
  })
  return weeklySettingsView(weeklyOrganisation(row))
})
