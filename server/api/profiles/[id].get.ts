import type { ProfileView } from '../../../shared/types/kennel'

/** One of the organisation's coat profiles. */
export default defineEventHandler(async (event): Promise<ProfileView> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'coat profile')
  const profile = await findProfile(caller, id)
  if (!profile) throw notFound('coat profile')
  const counts = await loadProfileDogCounts(kennelSequelize(), caller.organisationId)
  return profileView(profile, counts.get(id) ?? 0)
})
