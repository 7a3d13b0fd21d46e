import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { addDays, assessDog, type CoatWork } from '../../../shared/coat'
import { planStepKey } from '../../../shared/tasks'
import type { AuditEventView, CoatWorkLogItem, DogView, PlanView, ProfileView, ReadinessView } from '../../../shared/types/kennel'
import type { BathWindowView, FromPlanResult, PlanStepsView, TaskView, WeekBoardView } from '../../../shared/types/tasks'
import { call, database, expectFieldError, expectNo500, inDays, kennelPeople, makeDog, makeShow, ok, today, type KennelPeople } from '../helpers/kennelApi'

const db = database()
let p: KennelPeople
/** Handled by the handler, entered in a show 80 days out, so its plan has steps in the coming weeks. */
let dog: DogView
/** Handled by the other handler: out of the first handler's reach. */
let hidden: DogView
let foreignDog: DogView
let profile: ProfileView

const asWork = (w: CoatWorkLogItem): CoatWork => ({ date: w.date, kind: w.kind, regions: w.regions })

/** A task made by `jar` (a manager unless told), `fields` over invented defaults. */
function makeTask(fields: Record<string, unknown> = {}, jar = p.manager) {
  return ok<TaskView>(jar, '/api/tasks', 'POST', { dogId: dog.id, regions: ['neck'], kind: 'layer', dueDate: today(), ...fields })
}

async function liveWorkOfTask(taskId: number) {
  const { rows } = await db.query('SELECT id, deleted_at FROM coat_work WHERE task_id = $1 ORDER BY id', [taskId])
  return rows as { id: number, deleted_at: Date | null }[]
}

beforeAll(async () => {
  await db.connect()
  p = await kennelPeople()
  dog = await makeDog(p.manager, { handlerId: p.ids.handler, dateOfBirth: inDays(-400) })
  hidden = await makeDog(p.manager, { handlerId: p.ids.handler2 })
  const show = await makeShow(p.manager, 80)
  await ok(p.manager, '/api/entries', 'POST', { dogId: dog.id, showId: show.id, classCode: 'kc:junior' })
  foreignDog = await makeDog(p.foreign)
  profile = await ok<ProfileView>(p.manager, `/api/profiles/${dog.coatProfileId}`, 'GET')
})
afterAll(() => db.end())

describe('who may create a task', () => {
  it('a manager creates a task on any dog for anyone, pre-filled as given', async () => {
    const task = await makeTask({ dogId: hidden.id, assigneeId: p.ids.handler2, regions: ['neck', 'rear'], windowStart: '09:00', windowEnd: '10:30', notes: 'Gently.' })
    expect(task).toMatchObject({
      dog: { id: hidden.id }, regions: ['neck', 'rear'], kind: 'layer', dueDate: today(), windowStart: '09:00', windowEnd: '10:30',
      assignee: { id: p.ids.handler2 }, createdBy: { id: p.ids.manager }, status: 'open', notes: 'Gently.', coatWorkId: null, overdue: false,
    })
    expect(task.regionLabels).toEqual(['Neck', 'Rear'])
  })

  it.each([
    ['an assistant', () => p.ids.assistant],
    ['themselves', () => p.ids.handler],
  ] as [string, () => number][])('a handler gives a task on their own dog to %s', async (_, assignee) => {
    const task = await makeTask({ assigneeId: assignee() }, p.handler)
    expect(task.assignee?.id).toBe(assignee())
    expect(task.can).toMatchObject({ edit: true, assign: true, finish: true })
  })

  it('a handler may not give a task to a manager (403), nor make one on a dog out of their reach (404)', async () => {
    expect((await call(p.handler, '/api/tasks', 'POST', { dogId: dog.id, regions: ['neck'], kind: 'roll', dueDate: today(), assigneeId: p.ids.manager })).status).toBe(403)
    expect((await call(p.handler, '/api/tasks', 'POST', { dogId: hidden.id, regions: ['neck'], kind: 'roll', dueDate: today() })).status).toBe(404)
  })

  it('an assistant may not create tasks (403)', async () => {
    expect((await call(p.assistant, '/api/tasks', 'POST', { dogId: dog.id, regions: ['neck'], kind: 'roll', dueDate: today() })).status).toBe(403)
  })

  it('another organisation\'s dog is a 404, and a non-member assignee a 400 naming assigneeId', async () => {
    expect((await call(p.manager, '/api/tasks', 'POST', { dogId: foreignDog.id, regions: ['neck'], kind: 'roll', dueDate: today() })).status).toBe(404)
    expectFieldError(await call(p.manager, '/api/tasks', 'POST', { dogId: dog.id, regions: ['neck'], kind: 'roll', dueDate: today(), assigneeId: p.ids.foreign }), 'assigneeId')
  })

  it.each([
    ['regions', { regions: [] }],
    ['regions', { regions: ['wings'] }],
    ['kind', { kind: 'shave' }],
    ['dueDate', { dueDate: '2027-02-30' }], // ISO 8601 calendar date: February has no 30th
    ['windowStart', { windowStart: '25:00' }], // ISO 8601 time of day: hours run 00–23
    ['windowEnd', { windowStart: '11:00', windowEnd: '10:00' }],
    ['dogId', { dogId: 'seven' }],
    ['notes', { notes: 'bad\u0000note' }],
  ] as [string, object][])('a bad %s is a 400 naming it', async (field, change) => {
    expectFieldError(await call(p.manager, '/api/tasks', 'POST', { dogId: dog.id, regions: ['neck'], kind: 'layer', dueDate: today(), ...change }), field)
  })

  it('never answers 500 to a malformed body', async () => {
    await expectNo500(p.manager, 'POST', '/api/tasks', { dogId: hidden.id, regions: ['neck'], kind: 'layer', dueDate: today() }, 25)
  })
})

describe('who sees which task', () => {
  let mine: TaskView
  let theirs: TaskView
  let onHidden: TaskView
  beforeAll(async () => {
    mine = await makeTask({ assigneeId: p.ids.assistant })
    theirs = await makeTask({ assigneeId: p.ids.assistant2 })
    onHidden = await makeTask({ dogId: hidden.id, assigneeId: p.ids.assistant2 })
  })

  it('an assistant sees only the tasks given to them', async () => {
    const list = await ok<TaskView[]>(p.assistant, '/api/tasks', 'GET')
    expect(list.map(t => t.id)).toContain(mine.id)
    expect(list.every(t => t.assignee?.id === p.ids.assistant)).toBe(true)
    expect((await call(p.assistant, `/api/tasks/${theirs.id}`)).status).toBe(404)
    expect((await ok<TaskView>(p.assistant, `/api/tasks/${mine.id}`, 'GET')).can).toMatchObject({ edit: false, assign: false, start: true, finish: true })
  })

  it('a handler sees the tasks on their dogs, not those on another handler\'s dog', async () => {
    const list = await ok<TaskView[]>(p.handler, `/api/tasks?dog=${dog.id}`, 'GET')
    expect(list.map(t => t.id)).toEqual(expect.arrayContaining([mine.id, theirs.id]))
    expect((await call(p.handler, `/api/tasks/${onHidden.id}`)).status).toBe(404)
  })

  it('a manager sees every task and filters them', async () => {
    const list = await ok<TaskView[]>(p.manager, `/api/tasks?assignee=${p.ids.assistant2}&status=open`, 'GET')
    expect(list.map(t => t.id)).toEqual(expect.arrayContaining([theirs.id, onHidden.id]))
    expect(list.every(t => t.assignee?.id === p.ids.assistant2 && t.status === 'open')).toBe(true)
    const mineOnly = await ok<TaskView[]>(p.assistant, '/api/tasks?mine=true&status=active', 'GET')
    expect(mineOnly.every(t => t.status === 'open' || t.status === 'in-progress')).toBe(true)
  })

  it.each([
    ['GET', ''], ['PATCH', ''], ['DELETE', ''], ['POST', '/finish'], ['POST', '/skip'], ['POST', '/reopen'],
  ])('another organisation\'s %s on a task%s is a 404', async (method, suffix) => {
    const body = method === 'GET' || method === 'DELETE' ? undefined : suffix === '/skip' ? { reason: 'Not ours' } : suffix ? {} : { notes: 'x' }
    expect((await call(p.foreign, `/api/tasks/${mine.id}${suffix}`, method, body)).status).toBe(404)
  })

  it('an overdue open task says so', async () => {
    const late = await makeTask({ dueDate: inDays(-2), assigneeId: p.ids.assistant })
    expect(late.overdue).toBe(true)
  })
})

describe('assigning and moving', () => {
  it('a manager moves a task to another day and another person', async () => {
    const task = await makeTask({ assigneeId: p.ids.assistant })
    const moved = await ok<TaskView>(p.manager, `/api/tasks/${task.id}`, 'PATCH', { dueDate: inDays(3), assigneeId: p.ids.assistant2, windowStart: '08:00', windowEnd: '08:45' })
    expect(moved).toMatchObject({ dueDate: inDays(3), assignee: { id: p.ids.assistant2 }, windowStart: '08:00', windowEnd: '08:45' })
  })

  it('a handler reassigns a task on their dog to another assistant', async () => {
    const task = await makeTask({ assigneeId: p.ids.assistant })
    expect((await ok<TaskView>(p.handler, `/api/tasks/${task.id}`, 'PATCH', { assigneeId: p.ids.assistant2 })).assignee?.id).toBe(p.ids.assistant2)
  })

  it('an assistant starts their own task but may not move it, nor touch another\'s', async () => {
    const task = await makeTask({ assigneeId: p.ids.assistant })
    expect((await ok<TaskView>(p.assistant, `/api/tasks/${task.id}`, 'PATCH', { status: 'in-progress', minutes: 4 })).status).toBe('in-progress')
    expect((await call(p.assistant, `/api/tasks/${task.id}`, 'PATCH', { dueDate: inDays(2) })).status).toBe(403)
    const other = await makeTask({ assigneeId: p.ids.assistant2 })
    expect((await call(p.assistant, `/api/tasks/${other.id}`, 'PATCH', { status: 'in-progress' })).status).toBe(404)
  })

  it.each([
    ['assigneeId', { assigneeId: 2_000_000_000 }],
    ['status', { status: 'done' }],
    ['regions', { regions: ['wings'] }],
    ['(body)', {}],
  ] as [string, object][])('a bad %s in a change is a 400 naming it', async (field, change) => {
    const task = await makeTask()
    expectFieldError(await call(p.manager, `/api/tasks/${task.id}`, 'PATCH', change), field)
  })

  it('a task is deleted by a manager or its creator, never by an assistant, and not once done', async () => {
    const task = await makeTask({ assigneeId: p.ids.assistant }, p.handler)
    expect((await call(p.assistant, `/api/tasks/${task.id}`, 'DELETE')).status).toBe(403)
    expect((await call(p.handler, `/api/tasks/${task.id}`, 'DELETE')).status).toBe(204)
    expect((await call(p.manager, `/api/tasks/${task.id}`)).status).toBe(404)
    const done = await makeTask({ assigneeId: p.ids.assistant })
    await ok(p.assistant, `/api/tasks/${done.id}/finish`, 'POST', {}, 200)
    expect((await call(p.manager, `/api/tasks/${done.id}`, 'DELETE')).status).toBe(409)
  })
})

describe('finishing a task', () => {
  it('writes exactly one coat-work record, by the assignee, and moves the dog\'s readiness as the coat model says', async () => {
    const fresh = await makeDog(p.manager, { handlerId: p.ids.handler, dateOfBirth: inDays(-500) })
    // Neck: 42 days' sprout and 14 days' growth in the default profile (DESIGN.md §4), so a layer today blooms by then.
    const showDate = inDays(42 + 14)
    const readiness = () => ok<ReadinessView>(p.manager, `/api/dogs/${fresh.id}/readiness?date=${showDate}`, 'GET')
    const before = await readiness()
    const task = await makeTask({ dogId: fresh.id, regions: ['neck', 'throat'], assigneeId: p.ids.assistant })
    const done = await ok<TaskView>(p.assistant, `/api/tasks/${task.id}/finish`, 'POST', { minutes: 18, notes: 'Went well.' }, 200)
    expect(done).toMatchObject({ status: 'done', minutes: 18 })
    expect(done.doneAt).not.toBeNull()
    const rows = await liveWorkOfTask(task.id)
    expect(rows).toHaveLength(1)
    expect(done.coatWorkId).toBe(rows[0]!.id)

    const work = await ok<CoatWorkLogItem[]>(p.manager, `/api/dogs/${fresh.id}/work`, 'GET')
    expect(work).toHaveLength(1)
    expect(work[0]).toMatchObject({ date: today(), kind: 'layer', regions: ['neck', 'throat'], minutes: 18, notes: 'Went well.', taskId: task.id, workedBy: { id: p.ids.assistant } })
    const after = await readiness()
    expect(after.readiness).toEqual(assessDog(profile, work.map(asWork), showDate))
    expect(after.readiness.score).not.toBe(before.readiness.score)
  })

  it('finishing twice, even at once, is one 200 and one 409 and still one record', async () => {
    const task = await makeTask({ assigneeId: p.ids.assistant })
    const answers = await Promise.all([1, 2].map(() => call(p.assistant, `/api/tasks/${task.id}/finish`, 'POST', {})))
    expect(answers.map(a => a.status).sort()).toEqual([200, 409])
    expect((await call(p.manager, `/api/tasks/${task.id}/finish`, 'POST', {})).status).toBe(409)
    expect(await liveWorkOfTask(task.id)).toHaveLength(1)
  })

  it('the day it was done may be set, and another person named as having done it', async () => {
    const task = await makeTask({ assigneeId: p.ids.assistant })
    await ok(p.manager, `/api/tasks/${task.id}/finish`, 'POST', { date: inDays(-2), workedById: p.ids.assistant2 }, 200)
    const [work] = await ok<CoatWorkLogItem[]>(p.manager, `/api/dogs/${dog.id}/work?from=${inDays(-2)}&to=${inDays(-2)}`, 'GET').then(ws => ws.filter(w => w.taskId === task.id))
    expect(work).toMatchObject({ date: inDays(-2), workedBy: { id: p.ids.assistant2 }, recordedBy: { id: p.ids.manager } })
  })

  it.each([
    ['date', () => ({ date: inDays(1) })],
    ['date', () => ({ date: inDays(-401) })],
    ['workedById', () => ({ workedById: p.ids.foreign })],
    ['minutes', () => ({ minutes: -1 })],
  ] as [string, () => object][])('a bad %s is a 400 naming it, and nothing is recorded', async (field, body) => {
    const task = await makeTask({ assigneeId: p.ids.assistant })
    expectFieldError(await call(p.assistant, `/api/tasks/${task.id}/finish`, 'POST', body()), field)
    expect(await liveWorkOfTask(task.id)).toHaveLength(0)
    expect((await ok<TaskView>(p.manager, `/api/tasks/${task.id}`, 'GET')).status).toBe('open')
  })

  it.each([
    ['the other assistant', 'assistant2'],
    ['a handler of another dog', 'handler2'],
  ] as [string, 'assistant2' | 'handler2'][])('%s cannot finish it (404)', async (_, who) => {
    const task = await makeTask({ assigneeId: p.ids.assistant })
    expect((await call(p[who], `/api/tasks/${task.id}/finish`, 'POST', {})).status).toBe(404)
  })
})

describe('reopening and skipping a done task', () => {
  async function doneTask() {
    const task = await makeTask({ assigneeId: p.ids.assistant })
    await ok(p.assistant, `/api/tasks/${task.id}/finish`, 'POST', { minutes: 5 }, 200)
    return task
  }

  it.each([
    ['reopen', 'keepWork', {}],
    ['skip', 'removeWork', { reason: 'Logged on the wrong dog' }],
  ] as [string, string, object][])('%s without saying what happens to the coat work is a 400 naming %s', async (action, field, body) => {
    const task = await doneTask()
    expectFieldError(await call(p.manager, `/api/tasks/${task.id}/${action}`, 'POST', body), field)
    expect((await liveWorkOfTask(task.id)).filter(w => !w.deleted_at)).toHaveLength(1)
  })

  it.each([
    ['reopen', { keepWork: false }, 'open', false],
    ['reopen', { keepWork: true }, 'open', true],
    ['skip', { reason: 'Logged on the wrong dog', removeWork: true }, 'skipped', false],
    ['skip', { reason: 'Done, but not as planned', removeWork: false }, 'skipped', true],
  ] as [string, object, string, boolean][])('%s with %o leaves the task %s and keeps the work: %s', async (action, body, status, kept) => {
    const task = await doneTask()
    const answer = await ok<TaskView>(p.assistant, `/api/tasks/${task.id}/${action}`, 'POST', body, 200)
    expect(answer.status).toBe(status)
    const [row] = await liveWorkOfTask(task.id)
    expect(row!.deleted_at === null).toBe(kept)
    const listed = (await ok<CoatWorkLogItem[]>(p.manager, `/api/dogs/${dog.id}/work`, 'GET')).some(w => w.id === row!.id)
    expect(listed).toBe(kept)
  })

  it('a reopened task finished again records new work', async () => {
    const task = await doneTask()
    await ok(p.manager, `/api/tasks/${task.id}/reopen`, 'POST', { keepWork: false }, 200)
    await ok(p.assistant, `/api/tasks/${task.id}/finish`, 'POST', {}, 200)
    expect((await liveWorkOfTask(task.id)).filter(w => !w.deleted_at)).toHaveLength(1)
  })

  it('an open task is skipped with a reason only, and the reason must say something', async () => {
    const task = await makeTask({ assigneeId: p.ids.assistant })
    expectFieldError(await call(p.assistant, `/api/tasks/${task.id}/skip`, 'POST', { reason: 'no' }), 'reason')
    const skipped = await ok<TaskView>(p.assistant, `/api/tasks/${task.id}/skip`, 'POST', { reason: 'She was off colour.' }, 200)
    expect(skipped).toMatchObject({ status: 'skipped', skipReason: 'She was off colour.' })
    expect((await call(p.assistant, `/api/tasks/${task.id}/reopen`, 'POST', {})).status).toBe(200)
  })
})

describe('from the plan', () => {
  it('turns the coming weeks\' steps into tasks once, pre-filled from each step', async () => {
    const plan = await ok<PlanView>(p.manager, `/api/dogs/${dog.id}/plan`, 'GET')
    const offered = await ok<PlanStepsView>(p.handler, `/api/tasks/plan-steps?dog=${dog.id}`, 'GET')
    expect(offered.steps.length).toBeGreaterThan(0)
    // The same step keys from the dog's own plan route, through the shared key function.
    const planKeys = plan.plan.steps.filter(s => s.date >= offered.from && s.date <= offered.to).map(s => planStepKey(dog.id, s))
    expect(offered.steps.map(s => s.key)).toEqual(planKeys)

    const first = await ok<FromPlanResult>(p.handler, '/api/tasks/from-plan', 'POST', { dogId: dog.id, assigneeId: p.ids.assistant })
    expect(first.created).toHaveLength(offered.steps.length)
    for (const offer of offered.steps) {
      expect(first.created.find(t => t.planStepKey === offer.key)).toMatchObject({
        regions: offer.step.regions, kind: offer.step.kind, dueDate: offer.step.date, notes: offer.step.note || null, assignee: { id: p.ids.assistant },
      })
    }
    const second = await call<FromPlanResult>(p.manager, '/api/tasks/from-plan', 'POST', { dogId: dog.id })
    expect(second.status).toBe(200)
    expect(second.body.created).toEqual([])
    expect(second.body.existing.map(t => t.id).sort()).toEqual(first.created.map(t => t.id).sort())
    const { rows } = await db.query('SELECT count(*)::int AS n FROM tasks WHERE dog_id = $1 AND plan_step_key IS NOT NULL', [dog.id])
    expect(rows[0].n).toBe(offered.steps.length)
    const again = await ok<PlanStepsView>(p.manager, `/api/tasks/plan-steps?dog=${dog.id}`, 'GET')
    expect(again.steps.every(s => s.taskId !== null)).toBe(true)
  })

  it('one step by key, asked for twice at once, still makes one task', async () => {
    const other = await makeDog(p.manager, { handlerId: p.ids.handler })
    const show = await makeShow(p.manager, 70)
    await ok(p.manager, '/api/entries', 'POST', { dogId: other.id, showId: show.id, classCode: 'kc:open' })
    const { steps } = await ok<PlanStepsView>(p.manager, `/api/tasks/plan-steps?dog=${other.id}`, 'GET')
    const key = steps[0]!.key
    const answers = await Promise.all([1, 2].map(() => call<FromPlanResult>(p.manager, '/api/tasks/from-plan', 'POST', { dogId: other.id, steps: [{ key }] })))
    expect(answers.flatMap(a => a.body.created)).toHaveLength(1)
    expect(new Set(answers.flatMap(a => [...a.body.created, ...a.body.existing].map(t => t.id))).size).toBe(1)
  })

  it('an unknown step key is a 400 naming it; assistants may not; another organisation\'s dog is a 404', async () => {
    expectFieldError(await call(p.manager, '/api/tasks/from-plan', 'POST', { dogId: dog.id, steps: [{ key: 'no-such-step' }] }), 'steps.0.key')
    expect((await call(p.assistant, '/api/tasks/from-plan', 'POST', { dogId: dog.id })).status).toBe(403)
    expect((await call(p.manager, '/api/tasks/from-plan', 'POST', { dogId: foreignDog.id })).status).toBe(404)
    expect((await call(p.handler, '/api/tasks/from-plan', 'POST', { dogId: hidden.id })).status).toBe(404)
  })
})

describe('the week board', () => {
  it('has seven days from Monday, and a task adds its area-timer minutes to its assignee\'s load that day', async () => {
    const day = inDays(1)
    const board = () => ok<WeekBoardView>(p.manager, `/api/tasks/week?start=${day}`, 'GET')
    const before = await board()
    expect(before.days).toHaveLength(7)
    // ISO 8601: weeks start on Monday; 2024-01-01 was a Monday.
    expect(before.days.every((d, i) => d === addDays(before.days[0]!, i))).toBe(true)
    expect(new Date(`${before.days[0]}T00:00:00Z`).getUTCDay()).toBe(1)
    expect(before.days).toContain(day)
    const task = await makeTask({ dueDate: day, regions: ['neck', 'rear'], assigneeId: p.ids.assistant2 })
    const after = await board()
    const load = (b: WeekBoardView) => b.people.find(x => x.id === p.ids.assistant2)!.load[day]!
    expect(load(after) - load(before)).toBe(task.regionLimits.reduce((s, r) => s + r.minutes, 0))
    expect(after.people.find(x => x.id === p.ids.assistant2)?.role).toBe('assistant')
    expect(after.tasks.map(t => t.id)).toContain(task.id)
  })

  it('a handler\'s board offers assistants and themselves; assistants have no board (403)', async () => {
    const board = await ok<WeekBoardView>(p.handler, '/api/tasks/week', 'GET')
    expect(board.people.every(x => x.role === 'assistant' || x.id === p.ids.handler)).toBe(true)
    expect(board.days).toContain(today())
    expect((await call(p.assistant, '/api/tasks/week')).status).toBe(403)
  })
})

describe('area-timer limits', () => {
  it('come from the dog\'s coat profile, with the default where a region sets none', async () => {
    const copy = await ok<ProfileView>(p.manager, '/api/profiles', 'POST', { copyFrom: profile.id, label: `Timer test ${Date.now()}` })
    const regions = copy.regions.map(r => (r.key === 'neck' ? { ...r, timerMinutes: 25 } : { ...r, timerMinutes: undefined }))
    await ok(p.manager, `/api/profiles/${copy.id}`, 'PATCH', { regions: JSON.parse(JSON.stringify(regions)) }, 200)
    const timed = await makeDog(p.manager, { coatProfileId: copy.id })
    const task = await makeTask({ dogId: timed.id, regions: ['neck', 'rear'] })
    // DEFAULT_TIMER_MINUTES in shared/types/kennel.ts is 10: the team's default, no source.
    expect(task.regionLimits).toEqual([{ key: 'neck', label: 'Neck', minutes: 25 }, { key: 'rear', label: 'Rear', minutes: 10 }])
  })
})

describe('the bath window', () => {
  it('a bath done today opens 48 hours for layer work, listing the layer tasks due inside it', async () => {
    const bathed = await makeDog(p.manager, { handlerId: p.ids.handler })
    const show = await makeShow(p.manager, 60)
    await ok(p.manager, '/api/entries', 'POST', { dogId: bathed.id, showId: show.id, classCode: 'kc:open' })
    const closed = await ok<BathWindowView>(p.manager, `/api/tasks/bath-window?dog=${bathed.id}`, 'GET')
    expect(closed.window).toBeNull()

    const bath = await makeTask({ dogId: bathed.id, kind: 'bath', regions: ['neck', 'rear'], assigneeId: p.ids.assistant })
    const soon = await makeTask({ dogId: bathed.id, kind: 'layer', dueDate: inDays(1), assigneeId: p.ids.assistant })
    const later = await makeTask({ dogId: bathed.id, kind: 'layer', dueDate: inDays(5), assigneeId: p.ids.assistant })
    const roll = await makeTask({ dogId: bathed.id, kind: 'roll', dueDate: inDays(1), assigneeId: p.ids.assistant })
    await ok(p.assistant, `/api/tasks/${bath.id}/finish`, 'POST', {}, 200)

    const open = await ok<BathWindowView>(p.assistant, `/api/tasks/bath-window?dog=${bathed.id}`, 'GET')
    expect(open.window?.bathTask.id).toBe(bath.id)
    // DESIGN.md §4: layer work within 48 hours of a bath (common practice).
    expect(Date.parse(open.window!.until) - Date.parse(open.window!.from)).toBe(48 * 3600 * 1000)
    const ids = open.tasks.map(t => t.id)
    expect(ids).toContain(soon.id)
    expect(ids).not.toContain(later.id)
    expect(ids).not.toContain(roll.id)
    expect(open.steps.every(s => s.step.kind === 'layer' && s.step.date >= today() && s.step.date <= open.window!.untilLocal.date)).toBe(true)
  })

  it('a bath finished today but dated another day opens no window; a dog out of reach is a 404', async () => {
    const bathed = await makeDog(p.manager)
    const bath = await makeTask({ dogId: bathed.id, kind: 'bath', regions: ['neck'] })
    await ok(p.manager, `/api/tasks/${bath.id}/finish`, 'POST', { date: inDays(-3) }, 200)
    expect((await ok<BathWindowView>(p.manager, `/api/tasks/bath-window?dog=${bathed.id}`, 'GET')).window).toBeNull()
    expect((await call(p.assistant2, `/api/tasks/bath-window?dog=${bathed.id}`)).status).toBe(404)
    expect((await call(p.foreign, `/api/tasks/bath-window?dog=${bathed.id}`)).status).toBe(404)
  })
})

describe('the audit trail of a task', () => {
  // Every change is kept with who made it and the row before and after: common practice for a
  // record others act on (OWASP ASVS 5.0, chapter V16 "Security Logging and Error Handling"; from memory).
  it('records making, giving, finishing, reopening and deleting a task, each with its actor, and the dog\'s history shows them to managers and handlers only', async () => {
    const task = await makeTask({ notes: 'Audit me.' }, p.handler)
    await ok(p.handler, `/api/tasks/${task.id}`, 'PATCH', { assigneeId: p.ids.assistant, dueDate: inDays(1) }, 200)
    await ok(p.assistant, `/api/tasks/${task.id}/finish`, 'POST', { minutes: 7 }, 200)
    await ok(p.manager, `/api/tasks/${task.id}/reopen`, 'POST', { keepWork: false }, 200)
    expect((await call(p.assistant, `/api/tasks/${task.id}`, 'DELETE')).status).toBe(403)
    expect((await call(p.handler, `/api/tasks/${task.id}`, 'DELETE')).status).toBe(204)

    const { rows } = await db.query(`SELECT action, actor_id, before, after FROM audit_events WHERE entity = 'task' AND entity_id = $1 ORDER BY id`, [task.id])
    expect(rows.map(r => [r.action, r.actor_id])).toEqual([
      ['create', p.ids.handler], ['update', p.ids.handler], ['update', p.ids.assistant], ['update', p.ids.manager], ['delete', p.ids.handler],
    ])
    const [made, given, finished, reopened, deleted] = rows
    expect(made.before).toBeNull()
    expect(made.after).toMatchObject({ id: task.id, dogId: dog.id, status: 'open', notes: 'Audit me.', assigneeId: null })
    expect([given.before.assigneeId, given.after.assigneeId, given.after.dueDate]).toEqual([null, p.ids.assistant, inDays(1)])
    expect([finished.before.status, finished.after.status, finished.after.minutes]).toEqual(['open', 'done', 7])
    expect(finished.after.coatWorkId).toEqual(expect.any(Number))
    expect([reopened.before.status, reopened.after.status, reopened.after.coatWorkId]).toEqual(['done', 'open', null])
    expect(deleted.before).toMatchObject({ id: task.id, status: 'open' })
    expect(deleted.after).toBeNull()

    // The assistant reaches the dog through a task of their own (DESIGN.md §2), made here so this test stands alone.
    const reach = await makeTask({ assigneeId: p.ids.assistant })
    const history = await ok<AuditEventView[]>(p.handler, `/api/dogs/${dog.id}/history`, 'GET')
    expect(history.filter(e => e.entity === 'task' && e.entityId === task.id).map(e => e.action)).toEqual(['delete', 'update', 'update', 'update', 'create'])
    // The rows name people by id; the history gives their names with them (seeders/accounts.ts).
    const givenRow = history.find(e => e.entity === 'task' && e.entityId === task.id && e.action === 'update' && e.after?.status === 'open' && e.before?.assigneeId === null)
    expect(givenRow?.people[p.ids.assistant]).toBe('Pip Adeyemi-Rowe')
    const assistantsView = await ok<AuditEventView[]>(p.assistant, `/api/dogs/${dog.id}/history`, 'GET')
    expect(assistantsView.some(e => e.entity === 'task')).toBe(false)
    expect((await call(p.manager, `/api/tasks/${reach.id}`, 'DELETE')).status).toBe(204)
  })

  it('records each task made from the plan, and a refused change records nothing', async () => {
    const other = await makeDog(p.manager, { handlerId: p.ids.handler, dateOfBirth: inDays(-500) })
    const show = await makeShow(p.manager, 70)
    await ok(p.manager, '/api/entries', 'POST', { dogId: other.id, showId: show.id, classCode: 'kc:junior' })
    const result = await ok<FromPlanResult>(p.manager, '/api/tasks/from-plan', 'POST', { dogId: other.id })
    expect(result.created.length).toBeGreaterThan(0)
    const ids = result.created.map(t => t.id)
    const { rows } = await db.query(`SELECT entity_id, action FROM audit_events WHERE entity = 'task' AND entity_id = ANY($1::int[]) ORDER BY entity_id`, [ids])
    expect(rows).toEqual([...ids].sort((a, b) => a - b).map(id => ({ entity_id: id, action: 'create' })))

    // Refused inside the change's transaction (the task is done, a 409), so nothing is recorded.
    await ok(p.manager, `/api/tasks/${ids[0]}/finish`, 'POST', {}, 200)
    const count = async () => (await db.query(`SELECT count(*)::int AS n FROM audit_events WHERE entity = 'task' AND entity_id = $1`, [ids[0]])).rows[0].n as number
    const before = await count()
    expect((await call(p.manager, `/api/tasks/${ids[0]}`, 'PATCH', { dueDate: inDays(3) })).status).toBe(409)
    expect(await count()).toBe(before)
  })
})
