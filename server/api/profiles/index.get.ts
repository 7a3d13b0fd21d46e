import type { ProfileView } from '../../../shared/types/kennel'

/** The organisation's coat profiles, the default first (made from the built-in one on first use), each with how many dogs use it. */
export default defineEventHandler(async (event): Promise<ProfileView[]> => {
  const caller = await requireCaller(event)
  await ensureDefaultProfile(caller.organisationId)
  const sequelize = kennelSequelize()
  const [profiles, counts] = await Promise.all([loadProfiles(sequelize, caller.organisationId), loadProfileDogCounts(sequelize, caller.organisationId)])
  return [...profiles.values()]
    .sort((a, b) => Number(b.isDefault) - Number(a.isDefault) || a.label.localeCompare(b.label) || a.id - b.id)
    .map(p => profileView(p, counts.get(p.id) ?? 0))
})
