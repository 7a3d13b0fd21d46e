import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { CoatWorkLogItem, DogView } from '../../../shared/types/kennel'
import type { MemberView } from '../../../shared/types/organisation'
import { accessibilityProblems, browserPerTest, gotoHydrated, screenshot, signInThroughForm, type Page } from '../helpers/browser'
import { baseUrl, demoAccount, request, signedIn, type CookieJar } from '../helpers/http'
import { ok } from '../helpers/kennelApi'

const open = browserPerTest('dog-delete')

// Every dog below is invented for the test; a run-unique tag keeps runs apart.
const tag = Date.now().toString(36).slice(-6)
let serial = 0
const unique = (name: string) => `${name} ${tag}${++serial}`

let manager: CookieJar
// The dogs this file makes and does not delete itself, taken out at the end.
const made: number[] = []
const db = new pg.Client({ connectionString: process.env.DATABASE_URL })

beforeAll(async () => {
  await db.connect()
  manager = await signedIn('manager')
})
afterAll(async () => {
  // A dog with coat work cannot be deleted through the API (409, by design): the database takes it
  // and its coat work (ON DELETE CASCADE) out.
  try {
    await db.query('DELETE FROM dogs WHERE id = ANY($1::int[])', [made])
  }
  finally {
    await db.end()
  }
})

async function throwAwayDog(fields: Record<string, unknown> = {}) {
  const dog = await ok<DogView>(manager, '/api/dogs', 'POST', { callName: unique('Bramble'), registeredName: unique('Larkspur Hollow Bramblewick'), breed: 'Wire Fox Terrier', sex: 'dog', dateOfBirth: '2023-02-17', ...fields })
  made.push(dog.id)
  return dog
}

async function userIdOf(email: string) {
  const member = (await ok<MemberView[]>(manager, '/api/members', 'GET')).find(m => m.email === email)
  if (!member) throw new Error(`No member ${email}`)
  return member.userId
}

async function signInAndOpen(page: Page, role: 'manager' | 'handler', dog: DogView) {
  await signInThroughForm(page, role)
  await page.waitForURL(`${baseUrl}/`)
  await gotoHydrated(page, `${baseUrl}/dogs/${dog.id}`)
  await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe(dog.callName)
}

describe('deleting a dog from its page', () => {
  it.each(['desktop', 'phone'] as const)('a manager deletes a dog with nothing on record through the dialog (%s)', async (viewport) => {
    const dog = await throwAwayDog()
    const page = await open(viewport)
    await signInAndOpen(page, 'manager', dog)

    await page.getByTestId('dog-delete-open').click()
    const dialog = page.getByRole('dialog', { name: `Delete ${dog.callName}?` })
    await expect.poll(() => dialog.getByTestId('dog-delete-scope').textContent()).toMatch(/no coat work, show entries or tasks on record/)
    await expect.poll(() => dialog.textContent()).toMatch(/Retire it instead/)
    const confirm = dialog.getByTestId('dog-delete-confirm')
    const name = dialog.getByLabel(`Type ${dog.callName} to confirm`)
    // The focus moves to the name field once the look-up is done, so a keyboard user types next.
    await expect.poll(() => name.evaluate(el => el === document.activeElement)).toBe(true)
    expect(await confirm.isDisabled()).toBe(true)

    await name.fill(dog.callName.slice(0, -1))
    expect(await confirm.isDisabled()).toBe(true)
    await name.fill(`${dog.callName}x`)
    expect(await confirm.isDisabled()).toBe(true)
    await name.fill(`  ${dog.callName.toUpperCase()} `)
    expect(await confirm.isDisabled()).toBe(false)
    await screenshot(page, `dog-delete-dialog-${viewport}`)
    expect(await accessibilityProblems(page)).toEqual([])
    if (viewport === 'phone') expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360)

    await confirm.click()
    await page.waitForURL(`${baseUrl}/dogs`)
    await expect.poll(() => page.getByTestId('dog-deleted').textContent()).toMatch(`${dog.callName} was deleted.`)
    // The list has drawn (its count is there) before it is read for the dog.
    await page.getByTestId('dog-count').waitFor()
    expect(await page.locator(`[data-dog="${dog.callName}"]`).count()).toBe(0)
    expect((await request(manager, `/api/dogs/${dog.id}`)).status).toBe(404)
    // Shown once: back on the list later, the sentence is gone.
    await gotoHydrated(page, `${baseUrl}/dogs`)
    expect(await page.getByTestId('dog-deleted').count()).toBe(0)
  })

  it('a dog with coat work is kept: the dialog says so and offers retiring, which it does', async () => {
    const dog = await throwAwayDog()
    await ok(manager, `/api/dogs/${dog.id}/work`, 'POST', { date: '2025-06-02', kind: 'layer', regions: ['neck'] })
    const page = await open('desktop')
    await signInAndOpen(page, 'manager', dog)

    await page.getByTestId('dog-delete-open').click()
    const dialog = page.getByRole('dialog', { name: `Delete ${dog.callName}?` })
    await expect.poll(() => dialog.getByTestId('dog-delete-blocked').textContent()).toMatch(/1 coat-work record on record/)
    expect(await dialog.getByTestId('dog-delete-confirm').count()).toBe(0)
    await dialog.getByRole('button', { name: `Retire ${dog.callName}` }).click()
    await expect.poll(() => page.getByTestId('dog-details').textContent()).toMatch(/Retired/)
    expect((await ok<DogView>(manager, `/api/dogs/${dog.id}`, 'GET')).status).toBe('retired')
  })

  it('a refused delete says why in a sentence and leaves the dog as it was', async () => {
    const dog = await throwAwayDog()
    const page = await open('desktop')
    await signInAndOpen(page, 'manager', dog)
    await page.getByTestId('dog-delete-open').click()
    const dialog = page.getByRole('dialog', { name: `Delete ${dog.callName}?` })
    await dialog.getByLabel(`Type ${dog.callName} to confirm`).fill(dog.callName)
    // Someone logs work meanwhile: the server keeps the dog (409) and the dialog says so.
    await ok(manager, `/api/dogs/${dog.id}/work`, 'POST', { date: '2025-06-02', kind: 'roll', regions: ['rear'] })
    await dialog.getByTestId('dog-delete-confirm').click()
    await expect.poll(() => dialog.getByTestId('dog-delete-problem').textContent()).toBe(`${dog.callName} was not deleted: it has coat work, show entries or tasks on record. Retire it instead, so nothing logged is lost.`)
    expect(page.url()).toBe(`${baseUrl}/dogs/${dog.id}`)
    expect(await ok<DogView>(manager, `/api/dogs/${dog.id}`, 'GET')).toMatchObject({ callName: dog.callName, status: 'active' })
  })

  it('a handler is not offered the delete', async () => {
    const dog = await throwAwayDog({ handlerId: await userIdOf(demoAccount('handler').email) })
    const page = await open('desktop')
    await signInAndOpen(page, 'handler', dog)
    await page.getByTestId('work-quick-form').waitFor()
    expect(await page.getByTestId('dog-delete-open').count()).toBe(0)
  })
})

describe('worked by, on the coat-work form', () => {
  it.each(['desktop', 'phone'] as const)('a handler logs work done by an assistant and the log says so (%s)', async (viewport) => {
    const handler = demoAccount('handler')
    const assistant = demoAccount('assistant')
    const dog = await throwAwayDog({ handlerId: await userIdOf(handler.email) })
    const page = await open(viewport)
    await signInAndOpen(page, 'handler', dog)

    const form = page.getByTestId('work-quick-form')
    const workedBy = form.getByLabel('Worked by')
    // The signed-in person is the default.
    await expect.poll(async () => (await workedBy.locator('option:checked').textContent())?.trim()).toBe(`${handler.name} (you) · Handler`)
    await workedBy.selectOption({ label: `${assistant.name} · Assistant` })
    await form.getByLabel('Roll').check()
    await form.getByRole('button', { name: 'Every region' }).click()
    await screenshot(page, `work-form-worked-by-${viewport}`)
    expect(await accessibilityProblems(page)).toEqual([])
    if (viewport === 'phone') expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360)
    await form.getByRole('button', { name: 'Log the work' }).click()

    await expect.poll(() => page.getByTestId('work-logged').textContent()).toMatch(`worked by ${assistant.name}`)
    await expect.poll(() => page.getByTestId('work-item').count()).toBe(1)
    expect(await page.getByTestId('work-people').textContent()).toMatch(`Worked by ${assistant.name}, logged by ${handler.name}`)
    // The worker stays chosen for the next piece of the same session.
    expect((await workedBy.locator('option:checked').textContent())?.trim()).toBe(`${assistant.name} · Assistant`)
    const [work] = await ok<CoatWorkLogItem[]>(manager, `/api/dogs/${dog.id}/work`, 'GET')
    expect([work?.workedBy?.id, work?.recordedBy?.id]).toEqual([await userIdOf(assistant.email), await userIdOf(handler.email)])

    // Editing the entry shows who did it, and a change of notes leaves the worker as they were.
    await page.getByTestId('work-item').getByRole('button', { name: /^Edit/ }).click()
    const edit = page.getByTestId('work-edit-form')
    expect((await edit.getByLabel('Worked by').locator('option:checked').textContent())?.trim()).toBe(`${assistant.name} · Assistant`)
    await edit.getByLabel('Notes (optional)').fill('Light roll, stood well.')
    await edit.getByRole('button', { name: 'Save changes' }).click()
    await expect.poll(() => page.getByTestId('work-item').textContent()).toMatch(/stood well/)
    expect(await page.getByTestId('work-people').textContent()).toMatch(`Worked by ${assistant.name}, logged by ${handler.name}`)
  })
})
