import { gridQuerySchema } from '../../../shared/schemas/kennel'
import type { GridView } from '../../../shared/types/kennel'

/**
 * The coat grid: every active dog the caller may see, a cell per region of its profile. `?show=<id>`
 * assesses every dog for that show's first day (entered dogs first, their row's `show` set);
 * `?show=next` or none assesses each dog for its own next show with a live entry.
 */
export default defineEventHandler(async (event): Promise<GridView> => {
  const caller = await requireCaller(event)
  const { show } = await readKennelQuery(event, gridQuerySchema)
  const rows = typeof show === 'number' && show > MAX_ROW_ID ? null : await loadGridRows(caller, show, kennelSequelize())
  if (!rows) throw notFound('show')
  return buildGridView(rows)
})
