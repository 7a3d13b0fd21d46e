import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { closeSequelize } from '../../../server/database/connection'
import type { WeeklyPreviewView, WeeklySendResult } from '../../../shared/types/weekly'
import { isoWeekNumber } from '../../../shared/weekly'
import { accessibilityProblems, browserPerTest, gotoHydrated, screenshot, screenshotDir, type Page } from '../helpers/browser'
import { baseUrl, request, signedIn, type CookieJar } from '../helpers/http'
import { linkIn, startSmtp, type ReceivedMail } from '../helpers/smtp'
import { cloneDemo, type ClonePerson, type DemoClone } from '../helpers/weeklyOrg'

// The weekly status as people see it: the HTML part rendering in Chromium as a mail client's
// web view would, the manager's weekly page with its preview and "send now", and the
// one-button unsubscribe page. Works on its own copy of the invented demo (seeders/).

const open = browserPerTest('weekly')
let smtp: Awaited<ReturnType<typeof startSmtp>>
let clone: DemoClone
let manager: CookieJar
const mails = new Map<string, ReceivedMail>()

beforeAll(async () => {
  smtp = await startSmtp()
  // A short tag: the organisation's name shows in the navigation, and the copy's should fit it as the demo's does.
  clone = await cloneDemo('ui')
  manager = await signedIn(clone.person('manager'))
  // The manager's and one handler's status, sent now through the outbox to the test's SMTP server.
  for (const person of [clone.person('manager'), clone.person('tobias@larkspur.example')]) {
    const res = await request(manager, '/api/weekly/send-now', { method: 'POST', json: { userId: person.userId } })
    const { week } = await res.json() as WeeklySendResult
    const [mail] = await smtp.waitFor(() => smtp.to(person.email).some(m => m.parsed.subject?.startsWith(`Week ${isoWeekNumber(week)} at ${clone.kennelName}`)))
      .then(() => smtp.to(person.email))
    mails.set(person.email, mail!)
  }
})

afterAll(async () => {
  await closeSequelize()
  await smtp.stop()
})

async function signIn(page: Page, person: ClonePerson) {
  await gotoHydrated(page, `${baseUrl}/signin`)
  await page.getByLabel('E-mail').fill(person.email)
  await page.getByLabel('Password').fill(person.password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(`${baseUrl}/`)
}

/** A full-page screenshot from the top, so the sticky phone header sits where a person sees it. */
async function shoot(page: Page, name: string) {
  await page.evaluate(() => window.scrollTo(0, 0))
  await screenshot(page, name)
}

/**
 * A screenshot of the viewport with the preview at its top: Chromium leaves a sandboxed frame
 * out of a full-page capture, so the frame is shot where a person sees it.
 */
async function shootPreview(page: Page, name: string) {
  await page.evaluate(() => document.getElementById('weekly-preview')?.scrollIntoView({ block: 'start' }))
  await page.screenshot({ path: join(screenshotDir, `${name}.png`) })
}

/** Waits until the sandboxed frame has drawn the message's HTML. */
async function previewDrawn(page: Page) {
  await page.frameLocator('[data-testid="weekly-preview-html"]').getByText('Regions that need work this week').waitFor()
}

/** Whether the page is wider than its viewport (a sideways scroll on a phone). */
function overflowsSideways(page: Page) {
  return page.evaluate(() => document.documentElement.scrollWidth > document.documentElement.clientWidth + 1)
}

describe('the weekly status message in Chromium', () => {
  it.each([['desktop', 1280], ['phone', 360]] as const)('the HTML part reads at %s width (%i px), with no remote content', async (viewport, width) => {
    const page = await open(viewport)
    expect(page.viewportSize()?.width).toBe(width)
    const requests: string[] = []
    page.on('request', r => requests.push(r.url()))
    for (const [who, mail] of [['manager', mails.get(clone.person('manager').email)!], ['handler', mails.get(clone.person('tobias@larkspur.example').email)!]] as const) {
      await page.setContent(String(mail.parsed.html), { waitUntil: 'load' })
      await screenshot(page, `weekly-mail-${who}-${viewport}`)
      expect(await overflowsSideways(page), `${who} at ${viewport}`).toBe(false)
      // No image, font or style sheet is fetched: the message carries everything it shows.
      expect(requests.filter(u => !u.startsWith('about:') && !u.startsWith('data:'))).toEqual([])
      const text = await page.locator('body').innerText()
      expect(text).toContain('Dogs by their next show')
      expect(text).toMatch(/On track|Not on track/)
    }
  })
})

describe('the weekly page', () => {
  it('shows the settings, who gets it, and exactly what each person gets', async () => {
    const page = await open('desktop')
    await signIn(page, clone.person('manager'))
    await gotoHydrated(page, `${baseUrl}/weekly`)
    const list = page.getByTestId('weekly-recipients')
    await expect.poll(() => list.getByTestId('weekly-recipient').count()).toBe(5)
    const tobias = clone.person('tobias@larkspur.example')
    const row = (email: string) => list.locator(`[data-recipient="${email}"]`)
    expect(await row(tobias.email).getByTestId('weekly-state').getAttribute('data-state')).toMatch(/sent|pending|sending/)
    expect(await row(clone.person('assistant').email).getByTestId('weekly-state').textContent()).toContain('Not sent to assistants')
    expect(await accessibilityProblems(page)).toEqual([])
    await shoot(page, 'weekly-page-desktop')

    // The preview of a sent message is the message itself: the HTML in a sandboxed frame, and the text part.
    await row(tobias.email).getByTestId('weekly-preview-button').click()
    const frame = page.getByTestId('weekly-preview-html')
    await frame.waitFor()
    const api = await (await request(manager, `/api/weekly/preview?userId=${tobias.userId}`)).json() as WeeklyPreviewView
    expect(api.source).toBe('outbox')
    expect(await frame.getAttribute('sandbox')).toBe('')
    expect(await frame.getAttribute('srcdoc')).toBe(api.html)
    expect(String(mails.get(tobias.email)!.parsed.html).replace(/\r\n/g, '\n')).toBe(api.html)
    expect(await page.getByTestId('weekly-preview-subject').textContent()).toBe(api.subject)
    await previewDrawn(page)
    await shootPreview(page, 'weekly-preview-html-desktop')
    await page.getByTestId('weekly-part-text').click()
    expect(await page.getByTestId('weekly-preview-text').textContent()).toBe(api.text)
    await shootPreview(page, 'weekly-preview-text-desktop')
    expect(await accessibilityProblems(page)).toEqual([])
  })

  it('changes the day and hour, read on the organisation\'s clock', async () => {
    const page = await open('desktop')
    await signIn(page, clone.person('manager'))
    await gotoHydrated(page, `${baseUrl}/weekly`)
    const form = page.getByTestId('weekly-settings')
    await form.getByLabel('Day').selectOption({ label: 'Wednesday' })
    await form.getByLabel('Time').selectOption({ label: '09:00' })
    await form.getByRole('button', { name: 'Save' }).click()
    await expect.poll(() => page.getByTestId('weekly-schedule').textContent()).toContain('It goes out on Wednesday at 09:00 (Europe/London time)')
    const settings = await (await request(manager, '/api/weekly/settings')).json() as { day: number, hour: number }
    expect(settings).toMatchObject({ day: 3, hour: 9 })
    // Back to Monday 00:00, so this week's status stays due for the tests after this one.
    await request(manager, '/api/weekly/settings', { method: 'PATCH', json: { day: 1, hour: 0 } })
  })

  it('"Send now" for one person says what happened, and they are not sent it twice', async () => {
    const page = await open('phone')
    await signIn(page, clone.person('manager'))
    await gotoHydrated(page, `${baseUrl}/weekly`)
    const ines = clone.person('ines@larkspur.example')
    const row = page.getByTestId('weekly-recipients').locator(`[data-recipient="${ines.email}"]`)
    await row.getByTestId('weekly-send-one').click()
    const result = page.getByTestId('weekly-send-result')
    await expect.poll(() => result.textContent()).toMatch(/1 message queued/)
    expect(await result.locator('[data-outcome="queued"]').textContent()).toContain(ines.name)
    await expect.poll(() => row.getByTestId('weekly-state').getAttribute('data-state')).toMatch(/pending|sending|sent/)
    expect(await row.getByTestId('weekly-send-one').isDisabled()).toBe(true)
    expect(await overflowsSideways(page)).toBe(false)
    await shoot(page, 'weekly-page-phone')
    await row.getByTestId('weekly-preview-button').click()
    await previewDrawn(page)
    await shootPreview(page, 'weekly-preview-phone')
    await smtp.waitFor(() => smtp.to(ines.email).length > 0)
  })
})

describe('the unsubscribe page', () => {
  it('says whose weekly status from which organisation stops, stops it with one button, and can undo it', async () => {
    const tobias = clone.person('tobias@larkspur.example')
    const link = linkIn(mails.get(tobias.email)!, `${baseUrl}/unsubscribe/`)
    const page = await open('phone')
    await gotoHydrated(page, link)
    const ask = page.getByTestId('unsubscribe-ask')
    await ask.waitFor()
    // Opening the link changes nothing: only the button does (mail scanners open links).
    const listed = async () => ((await (await request(manager, '/api/weekly/recipients')).json()) as { recipients: { userId: number, unsubscribed: boolean }[] }).recipients.find(r => r.userId === tobias.userId)!.unsubscribed
    expect(await listed()).toBe(false)
    expect(await ask.textContent()).toContain(clone.kennelName)
    expect(await ask.textContent()).toContain(tobias.email)
    expect(await accessibilityProblems(page)).toEqual([])
    await screenshot(page, 'unsubscribe-ask-phone')

    await page.getByTestId('unsubscribe-confirm').click()
    const done = page.getByTestId('unsubscribe-done')
    await done.waitFor()
    expect(await done.textContent()).toContain('You are unsubscribed')
    expect(await listed()).toBe(true)
    expect(await accessibilityProblems(page)).toEqual([])
    await screenshot(page, 'unsubscribe-done-phone')

    await page.getByTestId('unsubscribe-undo').click()
    await expect.poll(() => page.getByTestId('unsubscribe-ask').textContent()).toContain('You are subscribed again')
    expect(await listed()).toBe(false)
  })

  it('a link that was altered says it does not work', async () => {
    const page = await open('desktop')
    await gotoHydrated(page, `${baseUrl}/unsubscribe/1-1-${'A'.repeat(43)}`)
    await page.getByTestId('unsubscribe-invalid').waitFor()
    expect(await accessibilityProblems(page)).toEqual([])
  })
})

describe('the weekly e-mail card on the home page', () => {
  it('tells a handler when theirs goes out, stops it and starts it again, as the manager\'s list then shows', async () => {
    const ines = clone.person('ines@larkspur.example')
    const listed = async () => ((await (await request(manager, '/api/weekly/recipients')).json()) as { recipients: { userId: number, unsubscribed: boolean }[] }).recipients.find(r => r.userId === ines.userId)!.unsubscribed
    const page = await open('phone')
    await signIn(page, ines)
    const card = page.getByTestId('weekly-mail-card')
    await card.waitFor()
    // The sending time as the organisation's settings give it (ISO 8601 weekday 1 = Monday), in words.
    const settings = await (await request(manager, '/api/weekly/settings')).json() as { day: number, hour: number, timeZone: string }
    const days = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday']
    expect(await page.getByTestId('weekly-mail-state').textContent()).toContain(`${days[settings.day - 1]}s at ${String(settings.hour).padStart(2, '0')}:00 (${settings.timeZone})`)
    await page.getByTestId('weekly-mail-stop').click()
    await expect.poll(() => page.getByTestId('weekly-mail-state').textContent()).toContain('You stopped it on')
    expect(await listed()).toBe(true)
    // The one button changes its words, so focus stays where the person clicked.
    expect(await page.evaluate(() => document.activeElement?.getAttribute('data-testid'))).toBe('weekly-mail-start')
    await card.scrollIntoViewIfNeeded()
    expect(await accessibilityProblems(page)).toEqual([])
    expect(await overflowsSideways(page)).toBe(false)
    await shoot(page, 'home-weekly-mail-stopped-phone')
    await page.getByTestId('weekly-mail-start').click()
    await expect.poll(() => page.getByTestId('weekly-mail-state').textContent()).toContain('You get it on')
    expect(await listed()).toBe(false)
  })
})
