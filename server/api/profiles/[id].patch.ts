import { checkProfile } from '../../../shared/coat/profile'
import { profilePatchSchema } from '../../../shared/schemas/kennel'
import type { ProfileView } from '../../../shared/types/kennel'

/** Changes a coat profile's label, tolerance, on-track score or regions. Managers only; checked by the coat model too; audited. */
export default defineEventHandler(async (event): Promise<ProfileView> => {
  const caller = await requireCaller(event, ['manager'])
  const id = await readRecordId(event, 'coat profile')
  const patch = await readKennelBody(event, profilePatchSchema)
  const { CoatProfileRow, sequelize } = useModels()
  const updated = await sequelize.transaction(async (transaction) => {
    const row = await CoatProfileRow.findOne({ where: { id, organisationId: caller.organisationId }, transaction, lock: transaction.LOCK.UPDATE })
    if (!row) throw notFound('coat profile')
    const merged = { ...storedProfile(row), ...patch }
    try {
      checkProfile(merged)
    }
    catch (error) {
      const message = (error as Error).message
      throw invalidField(/^Tolerance/.test(message) ? 'toleranceDays' : 'regions', message)
    }
    const before = auditSnapshot(row)
    await row.update(patch, { transaction })
    await recordAudit(caller, 'coat_profile', id, 'update', { before, after: auditSnapshot(row) }, transaction)
    return row
  })
  const counts = await loadProfileDogCounts(sequelize, caller.organisationId)
  return profileView(storedProfile(updated), counts.get(id) ?? 0)
})
