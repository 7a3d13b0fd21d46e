import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { CoatWorkLogItem, DogView } from '../../../shared/types/kennel'
import type { MemberView } from '../../../shared/types/organisation'
import type { TaskView } from '../../../shared/types/tasks'
import { accessibilityProblems, browserPerTest, gotoHydrated, screenshot, signInThroughForm, type Page } from '../helpers/browser'
import { baseUrl, signedIn, type CookieJar } from '../helpers/http'
import { ok } from '../helpers/kennelApi'

// A dog's record of changes on its page: what was logged, changed and given, in words, newest
// first; an assistant reads the coat work only (DESIGN.md §2: assistants see coat information).
const open = browserPerTest('dog-history')
const tag = Date.now().toString(36).slice(-6)
const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
let manager: CookieJar
let dog: DogView
let pipId: number

beforeAll(async () => {
  await db.connect()
  manager = await signedIn('manager')
  pipId = (await ok<MemberView[]>(manager, '/api/members', 'GET')).find(m => m.email === 'pip@larkspur.example')!.userId
  dog = await ok<DogView>(manager, '/api/dogs', 'POST', { callName: `Thimble ${tag}`, registeredName: `Larkspur Hollow Thimblewood ${tag}`, breed: 'Wire Fox Terrier', sex: 'bitch', dateOfBirth: '2022-06-14' })
  const work = await ok<CoatWorkLogItem>(manager, `/api/dogs/${dog.id}/work`, 'POST', { date: '2026-10-19', kind: 'layer', regions: ['neck'], workedById: pipId, minutes: 10 })
  await ok(manager, `/api/work/${work.id}`, 'PATCH', { minutes: 25 })
  const task = await ok<TaskView>(manager, '/api/tasks', 'POST', { dogId: dog.id, regions: ['neck'], kind: 'roll', dueDate: '2026-12-31' })
  await ok(manager, `/api/tasks/${task.id}`, 'PATCH', { assigneeId: pipId })
})
afterAll(async () => {
  // The dog has coat work, which the API keeps (409); the database takes it and its rows out.
  try {
    await db.query('DELETE FROM dogs WHERE id = $1', [dog.id])
  }
  finally {
    await db.end()
  }
})

async function openRecord(page: Page) {
  await gotoHydrated(page, `${baseUrl}/dogs/${dog.id}`)
  await page.getByTestId('dog-history-open').click()
  const list = page.getByTestId('dog-history-list')
  await list.waitFor()
  return list
}

describe('the record of changes on a dog\'s page', () => {
  for (const viewport of ['desktop', 'phone'] as const) {
    it(`a manager reads the coat work, the record and the task in words, newest first (${viewport})`, async () => {
      const page = await open(viewport)
      await signInThroughForm(page, 'manager')
      await page.waitForURL(`${baseUrl}/`)
      const list = await openRecord(page)
      const items = await list.locator(':scope > li > p:first-child').allTextContents()
      // Weekdays from the Gregorian calendar: 19 Oct 2026 is a Monday, 31 Dec 2026 a Thursday.
      expect(items).toEqual([
        `Maren Oakhurst gave the roll task on Neck, due Thu 31 Dec 2026, to Pip Adeyemi-Rowe`,
        `Maren Oakhurst made the roll task on Neck, due Thu 31 Dec 2026`,
        `Maren Oakhurst changed the layer of Mon 19 Oct 2026`,
        `Maren Oakhurst logged a layer on Neck, Mon 19 Oct 2026, worked by Pip Adeyemi-Rowe`,
        `Maren Oakhurst added Thimble ${tag}`,
      ])
        expect(await list.textContent()).toContain('Minutes: 10 min → 25 min')
      await page.getByTestId('dog-history').scrollIntoViewIfNeeded()
      expect(await accessibilityProblems(page)).toEqual([])
      expect(await page.evaluate(() => document.documentElement.scrollWidth > document.documentElement.clientWidth + 1)).toBe(false)
      await screenshot(page, `dog-history-${viewport}`)
    })
  }

  it('the record follows a change made on the page while it is open', async () => {
    const page = await open('desktop')
    await signInThroughForm(page, 'manager')
    await page.waitForURL(`${baseUrl}/`)
    const list = await openRecord(page)
    // The quick form logs a trim on the neck for today; the record gains its line at the top.
    const form = page.getByTestId('work-quick-form')
    await form.getByRole('radio', { name: 'Trim' }).check()
    await form.locator('[data-region="neck"]').click()
    await form.getByRole('button', { name: 'Log the work' }).click()
    await expect.poll(() => list.locator(':scope > li > p:first-child').first().textContent()).toMatch(/^Maren Oakhurst logged a trim on Neck, /)
  })

  it('an assistant with a task on the dog reads its coat work only', async () => {
    const page = await open('phone')
    await signInThroughForm(page, 'assistant')
    await page.waitForURL(`${baseUrl}/`)
    const list = await openRecord(page)
    const whats = await list.locator(':scope > li > p:last-child').allTextContents()
    expect(whats.length).toBeGreaterThan(0)
    expect(whats.every(w => w.startsWith('Coat work ·'))).toBe(true)
  })
})
