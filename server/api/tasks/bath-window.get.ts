import { BATH_WINDOW_HOURS } from '../../../shared/tasks'
import { dogQuerySchema } from '../../../shared/schemas/tasks'
import type { BathWindowView } from '../../../shared/types/tasks'

/**
 * The window a bath task done today opens: from its done time for 48 hours, with the dog's layer
 * plan steps dated inside it and the open layer tasks due by its end (DESIGN.md §4: layer work
 * within 48 hours of a bath).
 */
export default defineEventHandler(async (event): Promise<BathWindowView> => {
  const caller = await requireCaller(event)
  const query = await readKennelQuery(event, dogQuerySchema)
  const today = callerToday(caller)
  const dog = await requireDogRecord(caller, query.dog, today)
  const baths = await loadTaskViews(caller, {
    sql: `t.dog_id = :dogId AND t.kind = 'bath' AND t.status = 'done' AND t.done_at IS NOT NULL
      AND (t.coat_work_id IS NULL OR EXISTS (SELECT 1 FROM coat_work bw WHERE bw.id = t.coat_work_id AND bw.date = :today))`,
    replacements: { dogId: dog.id, today },
  }, today)
  const bath = baths
    .filter(b => instantToWallClock(new Date(b.doneAt!), caller.timeZone).date === today)
    .sort((a, b) => b.doneAt!.localeCompare(a.doneAt!))[0]
  if (!bath) return { dogId: dog.id, window: null, steps: [], tasks: [] }
  const from = new Date(bath.doneAt!)
  const until = new Date(from.getTime() + BATH_WINDOW_HOURS * 3_600_000)
  const untilLocal = instantToWallClock(until, caller.timeZone)
  const [offers, tasks] = await Promise.all([
    planOffers(caller, dog, { from: today, to: untilLocal.date }, today),
    loadTaskViews(caller, {
      sql: `t.dog_id = :dogId AND t.kind = 'layer' AND t.status IN ('open', 'in-progress') AND t.due_date <= :last`,
      replacements: { dogId: dog.id, last: untilLocal.date },
    }, today),
  ])
  return {
    dogId: dog.id,
    window: { bathTask: bath, from: from.toISOString(), until: until.toISOString(), untilLocal },
    steps: offers.filter(o => o.step.kind === 'layer'),
    tasks,
  }
})
