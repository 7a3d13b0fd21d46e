import { beforeAll, describe, expect, it } from 'vitest'
import { addCalendarMonths, addDays, ruleSetEdition, type RuleSet } from '../../../shared/coat'
import type { EntryView, ReadinessView, ShowView } from '../../../shared/types/kennel'
import type { OrganisationView } from '../../../shared/types/organisation'
import { accessibilityProblems, browserPerTest, screenshot, signInThroughForm, type Page } from '../helpers/browser'
import { baseUrl } from '../helpers/http'
import { call, inDays, kennelPeople, logWork, makeDog, makeShow, ok, TAG, type KennelPeople } from '../helpers/kennelApi'

const openFresh = browserPerTest('shows')

async function open(viewport: 'desktop' | 'phone', who: 'manager' | 'handler' | 'assistant' = 'manager') {
  const page = await openFresh(viewport)
  await signInThroughForm(page, who)
  await page.waitForURL(`${baseUrl}/`)
  return page
}

const noSidewaysScroll = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth)

// A dog ten months old on the first day: in one class and out of another of each rule set, by
// the age bounds in DESIGN.md §5 (The Kennel Club, Definitions of Classes: Minor Puppy six to not
// exceeding nine months, Junior six to eighteen; AKC Rules Ch. 3: Puppy six to under twelve, 12-18
// Month twelve to under eighteen; FCI show regulations: Puppy 6-9, Junior 9-18).
const AGE_MONTHS = 10
const CLASS_FOR_TEN_MONTHS: Record<RuleSet, { eligible: string, notEligible: string }> = {
  KC: { eligible: 'Junior', notEligible: 'Minor Puppy' },
  AKC: { eligible: 'Puppy', notEligible: '12-18 Month' },
  FCI: { eligible: 'Junior', notEligible: 'Puppy' },
}

let people: KennelPeople
let ruleSet: RuleSet
beforeAll(async () => {
  people = await kennelPeople()
  ruleSet = (await ok<OrganisationView>(people.manager, '/api/organisation', 'GET')).ruleSet
})

describe('shows in Chromium', () => {
  it('a manager adds a show through the form, then enters a dog and sees its class check and readiness', async () => {
    const firstDay = inDays(45)
    const closeDate = addDays(firstDay, -21)
    // A show already called this, on that first day: the server refuses a second one (409).
    const taken = await makeShow(people.manager, 45)
    const name = `Brackenfold Summer Open ${TAG}`
    const puppy = await makeDog(people.manager, { callName: `Wicket ${TAG}`, dateOfBirth: addCalendarMonths(firstDay, -AGE_MONTHS, 'month-end') })
    await logWork(people.manager, puppy.id, -20, 'layer', puppy.coatProfile.regions.map(r => r.key))

    const page = await open('desktop')
    await page.goto(`${baseUrl}/shows`)
    await page.getByTestId('new-show').click()
    await page.waitForURL(`${baseUrl}/shows/new`)
    const form = page.getByTestId('show-form')

    // The shared schema speaks as you type: a one-letter name, once you leave it, then gone as you go on.
    await form.getByLabel('Name of the show').fill('B')
    await form.getByLabel('Name of the show').blur()
    await expect.poll(() => page.locator('#show-name-error').textContent()).toBe('Give the show a name')
    await form.getByLabel('Name of the show').fill(taken.name)
    await expect.poll(() => page.locator('#show-name-error').count()).toBe(0)
    await form.getByLabel('First day').fill(taken.firstDay)
    await form.getByLabel('Last day').fill(addDays(taken.firstDay, -1))
    await expect.poll(() => page.locator('#show-last-day-error').textContent()).toBe('The last day cannot be before the first day')
    await form.getByLabel('Last day').fill(addDays(taken.firstDay, 1))
    await expect.poll(() => page.locator('#show-last-day-error').count()).toBe(0)
    await form.getByLabel('Organising club').fill('Brackenfold Terrier Club')
    await form.getByLabel('Place').fill('Low Meadow Showground, Brackenfold')
    await form.getByLabel('Judges').fill('Odalys Penhallow\nBertrand Quillfeather')
    await form.getByLabel('Date', { exact: true }).fill(closeDate)
    await form.getByLabel('Time', { exact: true }).fill('20:00')
    expect(await form.getByLabel('Time zone').inputValue()).toBe('Europe/London')
    expect(await accessibilityProblems(page)).toEqual([])

    // The server refuses the duplicate; everything typed stays in the form.
    await form.getByRole('button', { name: 'Add the show' }).click()
    await expect.poll(() => page.getByTestId('form-error').textContent()).toMatch(/already a show called/)
    expect(page.url()).toBe(`${baseUrl}/shows/new`)
    expect(await form.getByLabel('Name of the show').inputValue()).toBe(taken.name)
    expect(await form.getByLabel('Place').inputValue()).toBe('Low Meadow Showground, Brackenfold')
    expect(await form.getByLabel('Judges').inputValue()).toBe('Odalys Penhallow\nBertrand Quillfeather')
    expect(await form.getByLabel('Time', { exact: true }).inputValue()).toBe('20:00')
    await screenshot(page, 'show-form-desktop')

    await form.getByLabel('Name of the show').fill(name)
    await form.getByLabel('First day').fill(firstDay)
    await form.getByLabel('Last day').fill(addDays(firstDay, 1))
    await form.getByRole('button', { name: 'Add the show' }).click()
    await page.waitForURL(/\/shows\/\d+$/)
    const showId = Number(page.url().split('/').pop())
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe(name)
    const saved = await ok<ShowView>(people.manager, `/api/shows/${showId}`, 'GET')
    expect(saved.entriesClose).toEqual({ date: closeDate, time: '20:00' })
    expect(saved.judges).toEqual(['Odalys Penhallow', 'Bertrand Quillfeather'])
    expect(await page.getByTestId('show-closing').getByTestId('closing-time').textContent()).toMatch(/20:00 \(Europe\/London\)/)
    expect(await page.getByTestId('show-closing').getByTestId('closing-countdown').getAttribute('data-days')).toBe('24')

    // The rule set and its edition are stated, and defer to the schedule.
    expect(await page.getByTestId('rule-set').textContent()).toContain(ruleSetEdition(ruleSet))

    // Adding an entry: the class list is the rule set's, and the age check follows the pick.
    const classes = CLASS_FOR_TEN_MONTHS[ruleSet]
    await page.getByTestId('add-entry').click()
    const entryForm = page.getByTestId('entry-form')
    await entryForm.getByLabel('Dog').selectOption({ label: `${puppy.callName} (${puppy.registeredName})` })
    expect(await entryForm.getByTestId('entry-age').textContent()).toMatch(`is ${AGE_MONTHS} months`)
    await entryForm.getByLabel('Class').selectOption({ label: `${classes.notEligible} (not eligible by age)` })
    await expect.poll(() => entryForm.getByTestId('eligibility').getAttribute('data-eligible')).toBe('false')
    expect(await entryForm.getByTestId('eligibility').textContent()).toMatch(`Not eligible by age for ${classes.notEligible}`)
    await entryForm.getByLabel('Class').selectOption({ label: classes.eligible })
    await expect.poll(() => entryForm.getByTestId('eligibility').textContent()).toMatch(`Eligible by age for ${classes.eligible}`)
    await entryForm.getByLabel('Status').selectOption('entered')
    await entryForm.getByLabel('Armband').fill('27')
    await entryForm.getByLabel('Handler').selectOption({ label: 'Tobias Wrenfield' })
    await entryForm.getByRole('button', { name: 'Add the entry' }).click()

    const entry = page.locator(`[data-entry="${puppy.callName}"]`)
    await expect.poll(() => entry.getByTestId('entry-class').textContent()).toBe(classes.eligible)
    expect(await entry.getByTestId('eligibility').getAttribute('data-eligible')).toBe('true')
    expect(await entry.textContent()).toMatch(/27.*Tobias Wrenfield/s)
    // Readiness on the first day is the server's, worked out from the stored work.
    const readiness = await ok<ReadinessView>(people.manager, `/api/dogs/${puppy.id}/readiness?show=${showId}`, 'GET')
    await expect.poll(() => entry.getByTestId('readiness-score').textContent()).toBe(String(readiness.readiness.score))
    expect(await entry.getByTestId('readiness').getAttribute('data-on-track')).toBe(String(readiness.readiness.onTrack))
    await screenshot(page, 'show-desktop')
    expect(await accessibilityProblems(page)).toEqual([])

    // Moving the entry to a class the dog is too old for brings the server's warning onto the page.
    await entry.getByRole('button', { name: /^Edit/ }).click()
    await page.getByTestId('entry-edit-form').getByLabel('Class').selectOption({ label: `${classes.notEligible} (not eligible by age)` })
    await page.getByTestId('entry-edit-form').getByRole('button', { name: 'Save the entry' }).click()
    await expect.poll(() => entry.getByTestId('entry-warnings').textContent()).toMatch(`not eligible for ${classes.notEligible} by age`)
    const [stored] = await ok<EntryView[]>(people.manager, `/api/entries?show=${showId}`, 'GET')
    expect(stored!.warnings.length).toBeGreaterThan(0)

    await entry.getByRole('button', { name: /^Withdraw/ }).click()
    await expect.poll(() => entry.locator('[data-status]').getAttribute('data-status')).toBe('withdrawn')
  })

  it('the list shows the facts and the calendar marks show days and closing dates, by keyboard too', async () => {
    const firstDay = inDays(50)
    const show = await makeShow(people.manager, 50, {
      lastDay: addDays(firstDay, 1),
      club: 'Ravensgill Wire Club',
      place: 'Ravensgill Hall',
      judges: ['Mirela Stanhope'],
      entriesCloseDate: addDays(firstDay, -20),
      entriesCloseTime: '23:59',
    })
    const page = await open('desktop')
    await page.goto(`${baseUrl}/shows`)
    const card = page.locator(`[data-show="${show.name}"]`)
    await expect.poll(() => card.textContent()).toMatch(/Ravensgill Wire Club.*Ravensgill Hall.*Mirela Stanhope/s)
    expect(await card.getByTestId('closing-countdown').textContent()).toBe('Closes in 30 days')
    expect(await card.getByTestId('entry-count').textContent()).toMatch(/0 entries/)
    await screenshot(page, 'shows-desktop')
    expect(await accessibilityProblems(page)).toEqual([])

    await page.getByRole('button', { name: 'Past' }).click()
    await expect.poll(() => page.locator(`[data-show="${show.name}"]`).count()).toBe(0)
    await page.getByRole('button', { name: 'Calendar' }).click()
    const calendar = page.getByTestId('show-calendar')
    await calendar.waitFor()
    // The month is in the address; Next and Previous move it one month at a time.
    await page.goto(`${baseUrl}/shows?view=calendar&month=${firstDay.slice(0, 7)}`)
    await calendar.locator(`[data-day="${firstDay}"]`).waitFor()
    await page.getByTestId('calendar-next').click()
    await expect.poll(() => calendar.locator(`[data-day="${firstDay}"]`).count()).toBe(0)
    await page.getByTestId('calendar-previous').click()
    const day = calendar.locator(`[data-day="${firstDay}"]`)
    await expect.poll(() => day.textContent()).toContain(show.name)
    // Days are reached by the arrow keys from the one day in the tab order.
    await day.focus()
    await page.keyboard.press('ArrowRight')
    expect(await page.evaluate(() => document.activeElement?.getAttribute('data-day'))).toBe(addDays(firstDay, 1))
    await page.keyboard.press('Enter')
    await expect.poll(() => page.getByTestId('calendar-agenda').getByRole('link', { name: show.name }).count()).toBe(1)
    await screenshot(page, 'shows-calendar-desktop')
    expect(await accessibilityProblems(page)).toEqual([])
    await page.getByRole('button', { name: 'Show the whole month' }).click()
    await expect.poll(() => page.getByRole('button', { name: 'Show the whole month' }).count()).toBe(0)
    const closeDate = show.entriesClose!.date
    await page.goto(`${baseUrl}/shows?view=calendar&month=${closeDate.slice(0, 7)}`)
    await expect.poll(() => calendar.locator(`[data-day="${closeDate}"]`).textContent()).toContain(`entries close: ${show.name}`)
  })

  it('reads at 360 px: the list and a show page, nothing wider than the screen', async () => {
    const show = await makeShow(people.manager, 33, { place: 'Thornaby Moor Showground', judges: ['Aurelio Fenwick-Hale'], entriesCloseDate: inDays(5), entriesCloseTime: '12:00' })
    const dog = await makeDog(people.manager, { callName: `Bramblewick ${TAG}` })
    await ok(people.manager, '/api/entries', 'POST', { dogId: dog.id, showId: show.id, classCode: `${ruleSet.toLowerCase()}:open`, armband: '112', status: 'confirmed' })
    const page = await open('phone')
    await page.goto(`${baseUrl}/shows`)
    await page.locator(`[data-show="${show.name}"]`).waitFor()
    expect(await noSidewaysScroll(page)).toBeLessThanOrEqual(360)
    await screenshot(page, 'shows-phone')
    expect(await accessibilityProblems(page)).toEqual([])

    await page.goto(`${baseUrl}/shows/${show.id}`)
    await page.locator(`[data-entry="${dog.callName}"]`).getByTestId('readiness-score').waitFor()
    expect(await noSidewaysScroll(page)).toBeLessThanOrEqual(360)
    await screenshot(page, 'show-phone')
    expect(await accessibilityProblems(page)).toEqual([])

    await page.goto(`${baseUrl}/shows?view=calendar`)
    await page.getByTestId('show-calendar').waitFor()
    expect(await noSidewaysScroll(page)).toBeLessThanOrEqual(360)
    await screenshot(page, 'shows-calendar-phone')
  })

  it('a manager edits a show, deletes one with no entries, and is told why one with entries stays', async () => {
    const show = await makeShow(people.manager, 60, { place: 'Hollins Green Hall', entriesCloseDate: inDays(30), entriesCloseTime: '23:59' })
    const withEntry = await makeShow(people.manager, 61)
    const dog = await makeDog(people.manager)
    await ok(people.manager, '/api/entries', 'POST', { dogId: dog.id, showId: withEntry.id, classCode: `${ruleSet.toLowerCase()}:open` })

    const page = await open('desktop')
    await page.goto(`${baseUrl}/shows/${show.id}`)
    await page.getByRole('link', { name: 'Edit', exact: true }).click()
    await page.waitForURL(`${baseUrl}/shows/${show.id}/edit`)
    const form = page.getByTestId('show-form')
    // The form opens with the show as it is stored.
    expect(await form.getByLabel('Name of the show').inputValue()).toBe(show.name)
    expect(await form.getByLabel('Time', { exact: true }).inputValue()).toBe('23:59')
    await form.getByLabel('Place').fill('Hollins Green Pavilion')
    await form.getByLabel('Time', { exact: true }).fill('21:30')
    expect(await accessibilityProblems(page)).toEqual([])
    await form.getByRole('button', { name: 'Save changes' }).click()
    await page.waitForURL(`${baseUrl}/shows/${show.id}`)
    await expect.poll(() => page.getByTestId('show-closing').getByTestId('closing-time').textContent()).toMatch(/21:30 \(Europe\/London\)/)
    expect(await page.textContent('main')).toContain('Hollins Green Pavilion')

    await page.getByRole('button', { name: 'Delete' }).click()
    expect(await page.evaluate(() => document.activeElement?.getAttribute('data-testid'))).toBe('confirm-delete')
    await page.getByTestId('confirm-delete').click()
    await page.waitForURL(`${baseUrl}/shows`)
    expect((await call(people.manager, `/api/shows/${show.id}`)).status).toBe(404)

    await page.goto(`${baseUrl}/shows/${withEntry.id}`)
    await page.getByRole('button', { name: 'Delete' }).click()
    await page.getByTestId('confirm-delete').click()
    await expect.poll(() => page.getByRole('alertdialog').getByRole('alert').textContent()).toMatch(/has 1 entry; delete them first/)
    expect(page.url()).toBe(`${baseUrl}/shows/${withEntry.id}`)
  })

  it('a handler sees only the shows and entries of their dogs, and an assistant no shows at all', async () => {
    const theirs = await makeDog(people.manager, { callName: `Tansy ${TAG}`, handlerId: people.ids.handler })
    const nobodys = await makeDog(people.manager, { callName: `Quince ${TAG}` })
    const shared = await makeShow(people.manager, 30)
    const elsewhere = await makeShow(people.manager, 31)
    const openClass = `${ruleSet.toLowerCase()}:open`
    await ok(people.manager, '/api/entries', 'POST', { dogId: theirs.id, showId: shared.id, classCode: openClass })
    await ok(people.manager, '/api/entries', 'POST', { dogId: nobodys.id, showId: shared.id, classCode: openClass })
    await ok(people.manager, '/api/entries', 'POST', { dogId: nobodys.id, showId: elsewhere.id, classCode: openClass })

    const page = await open('desktop', 'handler')
    await page.goto(`${baseUrl}/shows`)
    await page.locator(`[data-show="${shared.name}"]`).waitFor()
    expect(await page.locator(`[data-show="${elsewhere.name}"]`).count()).toBe(0)
    expect(await page.getByTestId('new-show').count()).toBe(0)
    expect(await accessibilityProblems(page)).toEqual([])

    await page.locator(`[data-show="${shared.name}"]`).getByRole('link', { name: shared.name }).click()
    await page.locator(`[data-entry="${theirs.callName}"]`).waitFor()
    expect(await page.locator('[data-entry]').evaluateAll(rows => rows.map(r => r.getAttribute('data-entry')))).toEqual([theirs.callName])
    expect(await page.getByTestId('add-entry').count()).toBe(0)
    expect(await page.getByRole('button', { name: /^Withdraw/ }).count()).toBe(0)
    expect(await accessibilityProblems(page)).toEqual([])

    // A show with none of their dogs is not there for them at all: the server answers 404.
    await page.goto(`${baseUrl}/shows/${elsewhere.id}`)
    await expect.poll(() => page.getByRole('alert').textContent()).toMatch(/does not exist, or none of your dogs/)

    const assistant = await open('desktop', 'assistant')
    await assistant.goto(`${baseUrl}/shows`)
    await assistant.waitForURL(`${baseUrl}/`)
  })
})
