import { entryPatchSchema } from '../../../shared/schemas/kennel'
import type { EntryView } from '../../../shared/types/kennel'

/** Changes an entry's class, armband, status, handler or notes. Managers only; audited. */
export default defineEventHandler(async (event): Promise<EntryView> => {
  const caller = await requireCaller(event, ['manager'])
  const id = await readRecordId(event, 'entry')
  const patch = await readKennelBody(event, entryPatchSchema)
  if (patch.classCode) checkClassCode(caller, patch.classCode)
  if (patch.handlerId != null) await requireMember(caller, patch.handlerId, 'handlerId')
  const { Entry, sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const entry = await Entry.findOne({ where: { id, organisationId: caller.organisationId }, transaction, lock: transaction.LOCK.UPDATE })
    if (!entry) throw notFound('entry')
    const before = auditSnapshot(entry)
    await uniquely(() => entry.update(patch, { transaction }), 'This dog is already entered in that class at this show; change that entry instead.')
    await recordAudit(caller, 'entry', id, 'update', { before, after: auditSnapshot(entry) }, transaction)
  })
  return requireEntryView(caller, id)
})
