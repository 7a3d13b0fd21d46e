import { describe, expect, it } from 'vitest'
import { addDays } from '../../../shared/coat'
import type { ProfileView } from '../../../shared/types/kennel'
import { accessibilityProblems, browserPerTest, gotoHydrated, screenshot, signInThroughForm } from '../helpers/browser'
import { baseUrl, request, signedIn } from '../helpers/http'

// Saving and refreshing take a few requests; a second is not always enough on a busy machine.
const until = <T>(read: () => T | Promise<T>) => expect.poll(read, { timeout: 10_000 })

const open = browserPerTest('profiles')

async function profiles(): Promise<ProfileView[]> {
  const res = await request(await signedIn('manager'), '/api/profiles')
  expect(res.status).toBe(200)
  return await res.json() as ProfileView[]
}

describe('coat profiles in Chromium', () => {
  it('a manager copies the default profile, changes a region\'s growth, sees the preview move and saves', async () => {
    const before = await profiles()
    const fallback = before.find(p => p.isDefault)!
    const neck = fallback.regions.find(r => r.key === 'neck')!
    const grow = neck.growDays + 9
    const label = `Larkspur slow neck ${Date.now().toString(36)}`

    const page = await open('desktop')
    await signInThroughForm(page, 'manager')
    await page.waitForURL(`${baseUrl}/`)
    await gotoHydrated(page, `${baseUrl}/profiles`)
    const item = page.locator(`[data-testid="profile-item"][data-profile="${fallback.id}"]`)
    expect(await item.textContent()).toMatch(/Default/)
    expect(await item.getByTestId('profile-dog-count').textContent()).toBe(String(fallback.dogCount))
    expect(await accessibilityProblems(page)).toEqual([])

    await item.getByRole('button', { name: `Copy ${fallback.label}` }).click()
    await item.getByLabel('Name of the copy').fill(label)
    await item.getByRole('button', { name: 'Make the copy' }).click()
    await page.waitForURL(/\/profiles\/\d+$/)
    const copyId = Number(new URL(page.url()).pathname.split('/').pop())
    expect(copyId).not.toBe(fallback.id)

    // The preview is a layer taken today: bloom starts after sprout plus growth (DESIGN.md §4).
    const today = await page.evaluate(() => new Date().toLocaleDateString('en-CA'))
    const preview = page.locator('[data-testid="preview-region"][data-region="neck"]')
    await until(() => preview.getAttribute('data-bloom-start')).toBe(addDays(today, neck.sproutDays + neck.growDays))
    await page.locator('#region-neck-growDays').fill(String(grow))
    await until(() => preview.getAttribute('data-bloom-start')).toBe(addDays(today, neck.sproutDays + grow))

    // A figure the schema refuses shows its message as it is typed, and the form keeps it.
    await page.locator('#region-neck-holdDays').fill('')
    await until(() => page.locator('#region-neck-holdDays-error').textContent()).toBe('Give a number')
    await page.locator('#region-neck-holdDays').fill(String(neck.holdDays))
    await until(() => page.locator('#region-neck-holdDays-error').count()).toBe(0)

    await screenshot(page, 'profile-desktop')
    expect(await accessibilityProblems(page)).toEqual([])
    await page.getByRole('button', { name: 'Save the profile' }).click()
    await until(() => page.getByTestId('profile-saved').textContent()).toBe(`Saved ${label}.`)

    const after = await profiles()
    const copy = after.find(p => p.id === copyId)!
    expect(copy.label).toBe(label)
    expect(copy.isDefault).toBe(false)
    expect(copy.regions.find(r => r.key === 'neck')!.growDays).toBe(grow)
    // The default itself is untouched.
    expect(after.find(p => p.id === fallback.id)!.regions.find(r => r.key === 'neck')!.growDays).toBe(neck.growDays)
  })
})
