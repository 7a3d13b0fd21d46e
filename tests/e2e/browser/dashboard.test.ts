import { beforeAll, describe, expect, it } from 'vitest'
import { assessDog } from '../../../shared/coat'
import type { DashboardView, DogView, ShowView } from '../../../shared/types/kennel'
import type { OrganisationView } from '../../../shared/types/organisation'
import { accessibilityProblems, browserPerTest, screenshot, signInThroughForm, type Page } from '../helpers/browser'
import { baseUrl, signedIn, type CookieJar } from '../helpers/http'
import { inDays, logWork, makeDog, makeShow, ok } from '../helpers/kennelApi'

const openFresh = browserPerTest('dashboard')

async function open(viewport: 'desktop' | 'phone') {
  const page = await openFresh(viewport)
  await signInThroughForm(page, 'manager')
  await page.waitForURL(`${baseUrl}/`)
  await page.getByTestId('dashboard').waitFor()
  return page
}

// The show is 70 days out and closes in 6 days at 18:00 London time; one dog had a layer on
// every region today, the other has no work at all.
const SHOW_IN_DAYS = 70
const CLOSES_IN_DAYS = 6
let manager: CookieJar
let show: ShowView
let ready: DogView
let bare: DogView

beforeAll(async () => {
  manager = await signedIn('manager')
  ready = await makeDog(manager, { callName: `Juniper ${Date.now().toString(36)}` })
  bare = await makeDog(manager, { callName: `Sorrel ${Date.now().toString(36)}` })
  show = await makeShow(manager, SHOW_IN_DAYS, {
    club: 'Wrenmere Terrier Society',
    timeZone: 'Europe/London',
    entriesCloseDate: inDays(CLOSES_IN_DAYS),
    entriesCloseTime: '18:00',
  })
  await logWork(manager, ready.id, 0, 'layer', ready.coatProfile.regions.map(r => r.key))
  // Open takes any grown dog under each rule set (DESIGN.md §5), and the dogs are three years old.
  const { ruleSet } = await ok<OrganisationView>(manager, '/api/organisation', 'GET')
  for (const dog of [ready, bare]) await ok(manager, '/api/entries', 'POST', { dogId: dog.id, showId: show.id, classCode: `${ruleSet.toLowerCase()}:open`, status: 'entered' })
})

describe('the dashboard in Chromium', () => {
  it('a manager sees what closes soon, each dog for its next show, this week\'s work, the dogs with no record and the chart', async () => {
    const page = await open('desktop')
    const api = await ok<DashboardView>(manager, '/api/dashboard', 'GET')

    // Entries closing within 14 days: the countdown in days and the closing time on the show's clock.
    const closing = page.getByTestId('dashboard-closing').locator(`[data-show="${show.name}"]`)
    await expect.poll(() => closing.getByTestId('closing-countdown').textContent()).toMatch(`Closes in ${CLOSES_IN_DAYS} days`)
    expect(await closing.getByTestId('closing-time').textContent()).toMatch(/18:00 \(Europe\/London\)/)

    // DESIGN.md §4 (common practice, no source): a layer on every region 70 days before a show
    // brings the dog in on track; a dog with nothing logged is not, and scores what the model says.
    const group = page.getByTestId('dashboard-dogs').locator(`[data-show="${show.name}"]`)
    for (const [dog, work, onTrack] of [[ready, [{ date: inDays(0), kind: 'layer' as const, regions: ready.coatProfile.regions.map(r => r.key) }], 'true'], [bare, [], 'false']] as const) {
      const expected = assessDog(dog.coatProfile, [...work], show.firstDay)
      const row = group.locator(`[data-dog="${dog.callName}"]`)
      expect(await row.getByTestId('readiness').getAttribute('data-on-track')).toBe(onTrack)
      expect(Number(await row.getByTestId('readiness-score').textContent())).toBe(expected.score)
    }
    const bareRow = group.locator(`[data-dog="${bare.callName}"]`)
    expect(await bareRow.locator('[data-state="no-record"]').count()).toBeGreaterThan(0)
    // Dogs that need work come first within a show.
    const order = await group.locator('[data-dog]').evaluateAll(rows => rows.map(r => r.getAttribute('data-dog')))
    expect(order.indexOf(bare.callName)).toBeLessThan(order.indexOf(ready.callName))

    expect(await page.getByTestId('dashboard-no-record').getByRole('link', { name: bare.callName }).count()).toBe(1)
    expect(await page.getByTestId('dashboard-no-record').getByRole('link', { name: ready.callName }).count()).toBe(0)

    // With the show 70 days out, today is the last day to take a layer off the slow regions of
    // the dog with no record (DESIGN.md §4 work-back plan), so this week's work names it.
    const step = page.getByTestId('week-step').filter({ hasText: bare.callName })
    expect(await step.count()).toBeGreaterThan(0)
    expect(await step.first().textContent()).toMatch(/Take a layer/)
    expect(await page.getByTestId('dashboard-week').getByTestId('coat-cautions').textContent()).toMatch(/veterinarian/i)

    // The chart is drawn on its canvas, and the same figures are there as text and as a table.
    const canvas = page.getByTestId('dashboard-trend').locator('canvas')
    await canvas.waitFor()
    const painted = await canvas.evaluate((c: HTMLCanvasElement) => {
      const { data } = c.getContext('2d')!.getImageData(0, 0, c.width, c.height)
      let inked = 0
      for (let i = 3; i < data.length; i += 4) if (data[i]! > 0) inked++
      return { width: c.width, height: c.height, inked }
    })
    expect(painted.width).toBeGreaterThan(200)
    expect(painted.inked).toBeGreaterThan(500)
    expect(await canvas.getAttribute('aria-describedby')).toBe('trend-summary')
    expect(await page.getByTestId('trend-summary').textContent()).toMatch(`goes from ${api.trend.averageScore[0]} on `)
    await page.getByText('The figures as a table').click()
    const cells = page.getByTestId('trend-table').locator('tbody tr')
    expect(await cells.count()).toBe(api.trend.dates.length)
    expect(await cells.first().locator('td').first().textContent()).toBe(String(api.trend.averageScore[0]))
    expect(await cells.first().locator('td').nth(1).textContent()).toBe(`${Math.round(api.trend.onTrackShare[0]! * 100)}%`)

    await screenshot(page, 'dashboard-desktop')
    expect(await accessibilityProblems(page)).toEqual([])
  })

  it('reads at 360 px: every section there, nothing wider than the screen', async () => {
    const page = await open('phone')
    for (const section of ['dashboard-closing', 'dashboard-dogs', 'dashboard-week', 'dashboard-no-record', 'dashboard-trend']) {
      expect(await page.getByTestId(section).isVisible(), section).toBe(true)
    }
    await page.getByTestId('dashboard-trend').locator('canvas').waitFor()
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360)
    await screenshot(page, 'dashboard-phone')
    expect(await accessibilityProblems(page)).toEqual([])
  })
})
