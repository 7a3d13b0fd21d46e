import { describe, expect, it } from 'vitest'
import { SIGN_IN_FAILED } from '../../../shared/auth'
import { accessibilityProblems, browserPerTest, gotoHydrated, screenshot, signInThroughForm, type Page } from '../helpers/browser'
import { baseUrl } from '../helpers/http'

const open = browserPerTest('shell')

async function navLabels(page: Page) {
  return page.locator('nav[aria-label="Main"] a').allInnerTexts().then(texts => texts.map(t => t.trim()))
}

describe('the app shell in Chromium', () => {
  it('sends a visitor to the sign-in page, and a wrong password gets the shared message', async () => {
    const page = await open('desktop')
    await gotoHydrated(page, `${baseUrl}/team`)
    await page.waitForURL(/\/signin/)
    await screenshot(page, 'signin-desktop')
    expect(await accessibilityProblems(page)).toEqual([])
    await signInThroughForm(page, 'handler', 'not-the-password')
    await expect.poll(() => page.getByTestId('sign-in-message').textContent()).toBe(SIGN_IN_FAILED)
  })

  it.each(['desktop', 'phone'] as const)('a manager sees every section, changes nothing by looking, and signs out (%s)', async (viewport) => {
    const page = await open(viewport)
    await signInThroughForm(page, 'manager')
    await page.waitForURL(`${baseUrl}/`)
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toMatch(/Good (morning|afternoon|evening), Maren/)
    await screenshot(page, `manager-home-${viewport}`)
    expect(await accessibilityProblems(page)).toEqual([])
    if (viewport === 'phone') {
      // Readable at 360 px: nothing wider than the screen, so no sideways scrolling.
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360)
      await expect.poll(() => page.locator('nav[aria-label="Main"]').isVisible()).toBe(false)
      await page.getByTestId('menu-toggle').click()
      await screenshot(page, 'manager-menu-phone')
    }
    // The test app runs as the demo, so the demo mailbox is there too.
    expect(await navLabels(page)).toEqual(['Home', 'Coat grid', 'Week board', 'Dogs', 'Shows', 'Coat profiles', 'Team', 'Weekly status', 'Mail log', 'Demo mailbox', 'Organisation'])
    await page.locator('[data-nav="/team"]').click()
    await page.waitForURL(`${baseUrl}/team`)
    await expect.poll(() => page.getByTestId('team-list').locator('li').count()).toBe(5)
    await screenshot(page, `manager-team-${viewport}`)
    expect(await accessibilityProblems(page)).toEqual([])

    if (viewport === 'phone') await page.getByTestId('menu-toggle').click()
    await page.getByTestId('sign-out').click()
    await page.waitForURL(/\/signin/)
    await gotoHydrated(page, `${baseUrl}/`)
    await page.waitForURL(/\/signin/)
  })

  it.each(['desktop', 'phone'] as const)('an assistant sees their own work first and no team or settings (%s)', async (viewport) => {
    const page = await open(viewport)
    await signInThroughForm(page, 'assistant')
    await page.waitForURL(`${baseUrl}/`)
    await expect.poll(() => page.getByTestId('tasks-now').isVisible()).toBe(true)
    await expect.poll(() => page.getByTestId('coat-cautions').textContent()).toMatch(/veterinarian/i)
    await screenshot(page, `assistant-home-${viewport}`)
    expect(await accessibilityProblems(page)).toEqual([])
    if (viewport === 'phone') await page.getByTestId('menu-toggle').click()
    expect(await navLabels(page)).toEqual(['My tasks', 'Home', 'Dogs'])
    // The page is refused in the browser, and the data behind it by the server.
    await gotoHydrated(page, `${baseUrl}/team`)
    await page.waitForURL(`${baseUrl}/`)
  })

  it('a user of two organisations picks one and works there', async () => {
    const page = await open('desktop')
    await signInThroughForm(page, 'manager')
    await page.waitForURL(`${baseUrl}/`)
    await page.getByRole('link', { name: 'Switch organisation' }).click()
    await page.waitForURL(`${baseUrl}/organisations`)
    await screenshot(page, 'organisations-desktop')
    await page.locator('[data-organisation="Northfold Wire Terrier Club"]').click()
    await expect.poll(() => page.getByTestId('active-organisation').textContent()).toBe('Northfold Wire Terrier Club')
    expect(await navLabels(page)).toEqual(['Home', 'Coat grid', 'Week board', 'Dogs', 'Shows', 'Team'])
    await page.getByRole('link', { name: 'Switch organisation' }).click()
    await page.locator('[data-organisation="Larkspur Hollow Kennel"]').click()
    await expect.poll(() => page.getByTestId('active-organisation').textContent()).toBe('Larkspur Hollow Kennel')
  })
})
