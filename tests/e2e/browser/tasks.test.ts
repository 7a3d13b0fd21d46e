import { beforeAll, describe, expect, it } from 'vitest'
import type { DogView, GridView, PlanView, ShowView } from '../../../shared/types/kennel'
import type { MemberView } from '../../../shared/types/organisation'
import type { TaskView } from '../../../shared/types/tasks'
import { accessibilityProblems, browserPerTest, gotoHydrated, screenshot, signInThroughForm, type Page } from '../helpers/browser'
import { baseUrl, demoAccount, signedIn, type CookieJar } from '../helpers/http'
import { makeDog, makeShow, ok, TAG } from '../helpers/kennelApi'

const open = browserPerTest('tasks')

interface Fixture {
  manager: CookieJar
  dog: DogView
  show: ShowView
  pip: MemberView
  /** The plan steps of the coming four weeks, as the API plans them before any task exists. */
  plannedSteps: number
}
let fixture: Fixture
/** The layer task the manager gives to the assistant, once made. */
let given: TaskView

beforeAll(async () => {
  const manager = await signedIn('manager')
  const members = await ok<MemberView[]>(manager, '/api/members', 'GET')
  const pip = members.find(m => m.email === demoAccount('assistant').email)!
  // A show about eleven weeks out puts the layer windows of DESIGN.md §4 (42-day sprout, 14–28 days'
  // growth; common practice, no source) inside the coming four weeks, so the plan has steps to hand out.
  const show = await makeShow(manager, 80, { name: `Brackenfold Terrier Day ${TAG}` })
  const dog = await makeDog(manager, { callName: `Wrenna ${TAG}`, registeredName: `Hollins Wrenna ${TAG}` })
  // kc:open takes any dog of six months or more (The Kennel Club, Definitions of Classes).
  await ok(manager, '/api/entries', 'POST', { dogId: dog.id, showId: show.id, classCode: 'kc:open', status: 'entered' })
  const plan = await ok<PlanView>(manager, `/api/dogs/${dog.id}/plan`, 'GET')
  const until = new Date(`${plan.today}T00:00:00Z`)
  until.setUTCDate(until.getUTCDate() + 28)
  const plannedSteps = plan.plan.steps.filter(s => s.date >= plan.today && s.date <= until.toISOString().slice(0, 10)).length
  fixture = { manager, dog, show, pip, plannedSteps }
})

/** A full-page screenshot from the top, so the sticky phone header sits where a person sees it. */
async function shoot(page: Page, name: string) {
  await page.evaluate(() => window.scrollTo(0, 0))
  await screenshot(page, name)
}

async function signIn(page: Page, who: string) {
  await signInThroughForm(page, who)
  await page.waitForURL(`${baseUrl}/`)
}

describe('grooming tasks in Chromium', () => {
  it('a manager turns the plan into tasks on the dog page and gives one to an assistant on the week board', async () => {
    const { manager, dog, pip, plannedSteps } = fixture
    expect(plannedSteps).toBeGreaterThan(0)
    const page = await open('desktop')
    await signIn(page, 'manager')
    await gotoHydrated(page, `${baseUrl}/dogs/${dog.id}`)
    const panel = page.getByTestId('from-plan')
    await expect.poll(() => panel.locator('[data-has-task="false"]').count()).toBe(plannedSteps)
    await panel.getByTestId('from-plan-submit').click()
    await expect.poll(() => panel.getByTestId('from-plan-result').textContent()).toContain(`${plannedSteps} ${plannedSteps === 1 ? 'task' : 'tasks'} made`)
    // Every step now says it has its task, and nothing is left to make again.
    await expect.poll(() => panel.locator('[data-has-task="true"]').count()).toBe(plannedSteps)
    expect(await panel.getByTestId('from-plan-submit').count()).toBe(0)

    const tasks = await ok<TaskView[]>(manager, `/api/tasks?dog=${dog.id}`, 'GET')
    expect(tasks).toHaveLength(plannedSteps)
    expect(tasks.every(t => t.assignee === null && t.planStepKey)).toBe(true)
    given = tasks.find(t => t.kind === 'layer')!
    expect(given).toBeDefined()

    await gotoHydrated(page, `${baseUrl}/board?start=${given.dueDate}`)
    const grid = page.getByTestId('board-grid')
    const item = grid.locator(`[data-person="nobody"] [data-board-task="${given.id}"]`)
    await item.waitFor()
    await item.locator('summary').click()
    await item.getByTestId('move-person').selectOption(String(pip.userId))
    // Today's tasks come first on My tasks, so the task moves to today when today is in its week.
    const days = await grid.locator('thead th').evaluateAll(ths => ths.length)
    expect(days).toBe(8)
    const today = await ok<{ today: string, days: string[] }>(manager, `/api/tasks/week?start=${given.dueDate}`, 'GET')
    const day = today.days.includes(today.today) ? today.today : given.dueDate
    await item.getByTestId('move-day').selectOption(day)
    await item.getByTestId('move-submit').click()
    const moved = grid.locator(`[data-person="${pip.userId}"] [data-day="${day}"] [data-board-task="${given.id}"]`)
    await moved.waitFor()
    // The assistant's load that day counts the task: its regions' timer limits until minutes are known.
    const load = await grid.locator(`[data-person="${pip.userId}"] [data-day="${day}"] [data-testid="board-load"]`).textContent()
    expect(Number(load?.match(/(\d+) min/)?.[1])).toBeGreaterThanOrEqual(given.regionLimits.reduce((sum, r) => sum + r.minutes, 0))
    given = await ok<TaskView>(manager, `/api/tasks/${given.id}`, 'GET')
    expect(given.assignee?.id).toBe(pip.userId)
    expect(given.dueDate).toBe(day)
    await shoot(page, 'board-desktop')
    expect(await accessibilityProblems(page)).toEqual([])
  })

  it('the week board reads day by day on a phone', async () => {
    const page = await open('phone')
    await signIn(page, 'manager')
    await gotoHydrated(page, `${baseUrl}/board?start=${given.dueDate}`)
    const list = page.getByTestId('board-days')
    await list.locator(`[data-day="${given.dueDate}"] [data-board-task="${given.id}"]`).waitFor()
    expect(await list.locator(`[data-day="${given.dueDate}"] [data-board-task="${given.id}"]`).textContent()).toContain(fixture.pip.name)
    expect(await page.getByTestId('board-grid').isVisible()).toBe(false)
    await shoot(page, 'board-phone')
    expect(await accessibilityProblems(page)).toEqual([])
  })

  it('the assistant, on a phone, runs the area timer, finishes the task and the manager\'s grid shows the work', async () => {
    const { manager, dog, show } = fixture
    const region = given.regions[0]!
    const before = await ok<GridView>(manager, `/api/grid?show=${show.id}`, 'GET')
    const cellBefore = before.rows.find(r => r.dog.id === dog.id)!.cells[region]!
    // No strip or layer is logged yet, so the region has no record (DESIGN.md §4).
    expect(cellBefore.state).toBe('no-record')

    const page = await open('phone')
    // A fake clock drives the area timer: no test waits ten minutes.
    await page.clock.install()
    await signIn(page, 'assistant')
    await gotoHydrated(page, `${baseUrl}/tasks`)
    const card = page.locator(`[data-testid="task-card"][data-task="${given.id}"]`)
    await card.waitFor()
    expect(await card.getByTestId('dog-mark').textContent()).toBe(dog.callName[0]!.toUpperCase())
    expect(await card.locator(`[data-region="${region}"]`).getAttribute('data-marked')).toBe('true')
    expect(await page.getByTestId('coat-cautions').textContent()).toMatch(/veterinarian/i)
    await shoot(page, 'tasks-phone')
    expect(await accessibilityProblems(page)).toEqual([])

    await card.getByRole('link', { name: /start the task/i }).click()
    await page.waitForURL(`${baseUrl}/tasks/${given.id}`)
    const timer = page.getByTestId('area-timer')
    await timer.getByTestId('timer-region').selectOption(region)
    const limit = given.regionLimits.find(r => r.key === region)!.minutes
    await timer.getByTestId('timer-start').click()
    await page.clock.fastForward((limit - 1) * 60_000)
    await expect.poll(() => timer.getByTestId('timer-elapsed').textContent()).toBe(`${String(limit - 1).padStart(2, '0')}:00`)
    expect(await timer.getByTestId('timer-warning').count()).toBe(0)
    await page.clock.fastForward(2 * 60_000)
    await timer.getByTestId('timer-warning').waitFor()
    expect(await timer.getByTestId('timer-warning').textContent()).toContain(`${limit} minutes`)
    await shoot(page, 'task-timer-phone')
    await timer.getByTestId('timer-stop').click()
    await expect.poll(() => page.locator('#finish-minutes').inputValue()).toBe(String(limit + 1))

    await page.getByLabel('Notes (optional)').fill('Worked slowly; the skin stayed calm.')
    await page.getByTestId('finish-submit').click()
    await page.getByTestId('task-done').waitFor()
    await expect.poll(() => page.locator(`[data-task="${given.id}"]`).first().getAttribute('data-status')).toBe('done')
    expect(await page.getByTestId('task-done').textContent()).toContain(`${limit + 1} minutes`)
    await page.getByTestId('task-readiness').waitFor()
    await shoot(page, 'task-phone')
    expect(await accessibilityProblems(page)).toEqual([])

    await gotoHydrated(page, `${baseUrl}/tasks`)
    await expect.poll(() => page.getByTestId('tasks-done').locator(`[data-task="${given.id}"]`).getAttribute('data-status')).toBe('done')

    const after = await ok<GridView>(manager, `/api/grid?show=${show.id}`, 'GET')
    const cellAfter = after.rows.find(r => r.dog.id === dog.id)!.cells[region]!
    expect(cellAfter.state).not.toBe(cellBefore.state)

    const desk = await open('desktop')
    await signIn(desk, 'manager')
    await gotoHydrated(desk, `${baseUrl}/grid`)
    await desk.getByTestId('coat-grid').waitFor()
    await desk.getByTestId('grid-show').selectOption(String(show.id))
    await desk.getByTestId('grid-search').fill(dog.callName)
    const cell = desk.locator(`[data-dog="${dog.id}"] [data-region="${region}"] [data-state]`)
    await expect.poll(() => cell.getAttribute('data-state')).toBe(cellAfter.state)
  })

  it('reopening a done task asks whether to keep its coat work, and keeps it when told', async () => {
    const { manager, dog } = fixture
    const workBefore = await ok<unknown[]>(manager, `/api/dogs/${dog.id}/work`, 'GET')
    const page = await open('desktop')
    await signIn(page, 'manager')
    await gotoHydrated(page, `${baseUrl}/tasks/${given.id}`)
    await page.getByTestId('reopen-dialog-open').click()
    const dialog = page.getByTestId('reopen-dialog')
    // Nothing is chosen for the user: submitting without a choice is refused on the page.
    await dialog.getByTestId('reopen-submit').click()
    await expect.poll(() => dialog.getByRole('alert').textContent()).toMatch(/keep or remove/i)
    await dialog.getByTestId('reopen-work-keep').check()
    await dialog.getByTestId('reopen-submit').click()
    await expect.poll(() => page.locator(`[data-task="${given.id}"]`).first().getAttribute('data-status')).toBe('open')
    expect(await ok<unknown[]>(manager, `/api/dogs/${dog.id}/work`, 'GET')).toHaveLength(workBefore.length)
  })

  it('a bath done today shows its 48-hour window on My tasks and on the dog page, and skipping it asks about its work', async () => {
    const { manager, dog, pip } = fixture
    const assistant = await signedIn('assistant')
    const { today } = await ok<{ today: string }>(manager, '/api/tasks/week', 'GET')
    const bath = await ok<TaskView>(manager, '/api/tasks', 'POST', { dogId: dog.id, kind: 'bath', regions: dog.coatProfile.regions.map(r => r.key), dueDate: today, assigneeId: pip.userId })
    await ok(assistant, `/api/tasks/${bath.id}/finish`, 'POST', {}, 200)
    const page = await open('phone')
    await signIn(page, 'assistant')
    await gotoHydrated(page, `${baseUrl}/tasks`)
    // Work within 48 hours of a bath (DESIGN.md §4, common practice).
    await expect.poll(() => page.getByTestId('bath-window').first().textContent()).toContain('48 hours')
    const desk = await open('desktop')
    await signIn(desk, 'manager')
    await gotoHydrated(desk, `${baseUrl}/dogs/${dog.id}`)
    await expect.poll(() => desk.getByTestId('bath-window').textContent()).toContain(dog.callName)

    // Skipping the done bath asks about its coat work too; removing it takes it out of the log.
    const workBefore = await ok<{ id: number }[]>(manager, `/api/dogs/${dog.id}/work`, 'GET')
    await gotoHydrated(desk, `${baseUrl}/tasks/${bath.id}`)
    await desk.getByTestId('skip-dialog-open').click()
    const dialog = desk.getByTestId('skip-dialog')
    await dialog.getByTestId('skip-reason').fill('The bath was cut short by rain.')
    await dialog.getByTestId('skip-work-remove').check()
    await dialog.getByTestId('skip-submit').click()
    await expect.poll(() => desk.locator(`[data-task="${bath.id}"]`).first().getAttribute('data-status')).toBe('skipped')
    expect(await ok<unknown[]>(manager, `/api/dogs/${dog.id}/work`, 'GET')).toHaveLength(workBefore.length - 1)
  })
})
