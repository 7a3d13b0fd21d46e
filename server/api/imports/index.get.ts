import type { ImportCounts, ImportHistoryView, ImportMapping } from '../../../shared/import'

/** The organisation's imports, newest first (at most 100): who, when, which file, what it did and the mapping. Managers only. */
export default defineEventHandler(async (event): Promise<ImportHistoryView[]> => {
  const caller = await requireCaller(event, ['manager'])
  const { ImportRecord, User } = useModels()
  const rows = await ImportRecord.findAll({
    where: { organisationId: caller.organisationId },
    include: [{ model: User, as: 'user', attributes: ['id', 'name'] }],
    order: [['createdAt', 'DESC'], ['id', 'DESC']],
    limit: 100,
  })
  return rows.map((r) => {
    const user = (r as typeof r & { user?: { id: number, name: string } | null }).user
    return {
      id: r.id,
      fileName: r.fileName,
      createdAt: r.createdAt.toISOString(),
      user: user ? { id: user.id, name: user.name } : null,
      counts: r.counts as ImportCounts,
      mapping: r.mapping as ImportMapping,
      leftOut: r.leftOut.rows.length,
    }
  })
})
