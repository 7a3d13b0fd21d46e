import type { TaskView } from '../../../shared/types/tasks'

/** One task the caller may see. */
export default defineEventHandler(async (event): Promise<TaskView> => {
  const caller = await requireCaller(event)
  const id = await readRecordId(event, 'task')
  return requireTaskView(caller, id)
})
