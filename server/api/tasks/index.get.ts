import { taskListQuerySchema } from '../../../shared/schemas/tasks'
import type { TaskView } from '../../../shared/types/tasks'

/** The caller's tasks (managers: all; handlers: on their dogs and those they created; assistants: their own), filtered. */
export default defineEventHandler(async (event): Promise<TaskView[]> => {
  const caller = await requireCaller(event)
  const query = await readKennelQuery(event, taskListQuerySchema)
  const parts: string[] = ['true']
  if (query.mine === 'true') parts.push('t.assignee_id = :me')
  if (query.from) parts.push('t.due_date >= :from')
  if (query.to) parts.push('t.due_date <= :to')
  if (query.status === 'active') parts.push(`t.status IN ('open', 'in-progress')`)
  else if (query.status) parts.push('t.status = :status')
  if (query.dog !== undefined) parts.push('t.dog_id = :dog')
  if (query.assignee !== undefined) parts.push('t.assignee_id = :assignee')
  return loadTaskViews(caller, { sql: parts.join(' AND '), replacements: { ...query, me: caller.userId } })
})
