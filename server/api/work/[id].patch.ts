import { workPatchSchema } from '../../../shared/schemas/kennel'
import type { WorkKind } from '../../../shared/coat'
import type { CoatWorkLogItem } from '../../../shared/types/kennel'

/** Changes a piece of coat work. Its author or a manager only; the change is audited with before and after. */
export default defineEventHandler(async (event): Promise<CoatWorkLogItem> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'coat work')
  const patch = await readKennelBody(event, workPatchSchema)
  const { sequelize } = useModels()
  await sequelize.transaction(async (transaction) => {
    const { work, dog } = await requireEditableWork(caller, id, transaction)
    await checkWorkFields(caller, dog, patch)
    const before = auditSnapshot(work)
    const { regions, kind, ...rest } = patch
    await work.update({
      ...rest,
      ...(kind ? { kind: kind as WorkKind } : {}),
      ...(regions ? { regions: [...new Set(regions)] } : {}),
    }, { transaction })
    await recordAudit(caller, 'coat_work', id, 'update', { before, after: auditSnapshot(work) }, transaction)
  })
  const [row] = await loadWorkRecords({ sql: 'w.id = :id', replacements: { id } })
  return coatWorkView(caller, row!)
})
