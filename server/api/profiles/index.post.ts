import { profileCreateSchema } from '../../../shared/schemas/kennel'
import type { ProfileView } from '../../../shared/types/kennel'

/** A copy of one of the organisation's coat profiles under a new label, to edit with PATCH. Managers only. */
export default defineEventHandler(async (event): Promise<ProfileView> => {
  const caller = await requireCaller(event, ['manager'])
  const body = await readKennelBody(event, profileCreateSchema)
  const source = await findProfile(caller, body.copyFrom)
  if (!source) throw invalidField('copyFrom', 'No such coat profile in this organisation')
  const { CoatProfileRow, sequelize } = useModels()
  const profiles = await loadProfiles(sequelize, caller.organisationId)
  const key = uniqueProfileKey(body.label, new Set([...profiles.values()].map(p => p.key)))
  const created = await sequelize.transaction(async (transaction) => {
    const row = await uniquely(() => CoatProfileRow.create({
      organisationId: caller.organisationId,
      key,
      label: body.label,
      toleranceDays: source.toleranceDays,
      onTrackScore: source.onTrackScore,
      regions: source.regions,
      isDefault: false,
    }, { transaction }), 'Another coat profile was just made with that name; try again.')
    await recordAudit(caller, 'coat_profile', row.id, 'create', { after: auditSnapshot(row) }, transaction)
    return row
  })
  setResponseStatus(event, 201)
  return profileView(storedProfile(created), 0)
})
