import { addDays } from '../../../shared/coat'
import { weekQuerySchema } from '../../../shared/schemas/tasks'
import type { Role } from '../../../shared/types/organisation'
import type { BoardPerson, WeekBoardView } from '../../../shared/types/tasks'

/**
 * The week board for managers and handlers: seven days from Monday, the people tasks can be given
 * to (a handler: the assistants and themselves), each person's planned minutes per day, and the
 * tasks due that week; the week that holds today also carries the overdue tasks from before it.
 */
export default defineEventHandler(async (event): Promise<WeekBoardView> => {
  const caller = await requireCaller(event, ['manager', 'handler'])
  const query = await readKennelQuery(event, weekQuerySchema)
  const today = callerToday(caller)
  const monday = isoWeekMonday(query.start ?? today)
  const days = Array.from({ length: 7 }, (_, i) => addDays(monday, i))
  const sunday = days[6]!
  const holdsToday = today >= monday && today <= sunday
  const [tasks, members] = await Promise.all([
    loadTaskViews(caller, {
      sql: `(t.due_date BETWEEN :monday AND :sunday) OR (:holdsToday AND t.status IN ('open', 'in-progress') AND t.due_date < :monday)`,
      replacements: { monday, sunday, holdsToday },
    }, today),
    selectRows<{ id: number, name: string, role: Role }>(kennelSequelize(),
      `SELECT u.id, u.name, m.role FROM memberships m JOIN users u ON u.id = m.user_id
       WHERE m.organisation_id = :organisationId AND (:manager OR m.role = 'assistant' OR u.id = :me)
       ORDER BY CASE m.role WHEN 'assistant' THEN 0 WHEN 'handler' THEN 1 ELSE 2 END, lower(u.name), u.id`,
      { organisationId: caller.organisationId, manager: caller.role === 'manager', me: caller.userId }),
  ])
  const people: BoardPerson[] = members.map(m => ({ ...m, load: Object.fromEntries(days.map(d => [d, 0])), totalMinutes: 0 }))
  const byId = new Map(people.map(p => [p.id, p]))
  for (const task of tasks) {
    const who = task.assignee && byId.get(task.assignee.id)
    if (!who || task.status === 'skipped' || !(task.dueDate in who.load)) continue
    // Minutes spent once known; until then the regions' area-timer limits are the plan.
    const minutes = task.minutes ?? task.regionLimits.reduce((sum, r) => sum + r.minutes, 0)
    who.load[task.dueDate]! += minutes
    who.totalMinutes += minutes
  }
  return { today, days, people, tasks }
})
