import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { InvitationView } from '../../../shared/types/invitations'
import { accessibilityProblems, browserPerTest, gotoHydrated, screenshot, signInThroughForm, type Page } from '../helpers/browser'
import { baseUrl, type CookieJar, request, signedIn } from '../helpers/http'
import { invitationLink, mailsTo, removeIfMember, waitForMail, type Smtp } from '../helpers/invitations'
import { linkIn, startSmtp } from '../helpers/smtp'

// Invented people; `.example` is reserved (RFC 2606 §3).
const IRIS = { email: 'iris.newcomer@guests.example', name: 'Iris Newcomer', password: 'iris-chosen-password' }
const LATE = 'late.lachlan@guests.example'

const open = browserPerTest('invitations')
const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
let smtp: Smtp
let manager: CookieJar
let link: string

beforeAll(async () => {
  await db.connect()
  smtp = await startSmtp()
  manager = await signedIn('manager')
})

afterAll(async () => {
  // Leave the demo team as seeded: later files count its members.
  await removeIfMember(manager, IRIS.email)
  const openOnes = await (await request(manager, '/api/invitations')).json() as InvitationView[]
  for (const inv of openOnes) await request(manager, `/api/invitations/${inv.id}`, { method: 'DELETE' })
  await smtp.stop()
  await db.end()
})

/** A full-page screenshot from the top. */
async function shoot(page: Page, name: string) {
  await page.evaluate(() => window.scrollTo(0, 0))
  await screenshot(page, name)
}

async function fitsThePhone(page: Page) {
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360)
}

describe('invitations in Chromium', () => {
  it('a manager invites someone from the Team page at 1280 px and sees the open invitation', async () => {
    const page = await open('desktop')
    await signInThroughForm(page, 'manager')
    await page.waitForURL(`${baseUrl}/`)
    await gotoHydrated(page, `${baseUrl}/team`)
    const form = page.getByTestId('invite-form')
    await form.getByLabel('E-mail').fill(IRIS.email)
    await form.getByLabel('Name (optional)').fill(IRIS.name)
    await form.getByLabel('Role').selectOption('assistant')
    await form.getByRole('button', { name: 'Send invitation' }).click()
    await expect.poll(() => page.getByTestId('invite-done').textContent()).toBe(`Invitation sent to ${IRIS.email}.`)
    const row = page.locator(`[data-invitation="${IRIS.email}"]`)
    await expect.poll(() => row.textContent()).toMatch(/Role: Assistant.*Invited by: Maren Oakhurst.*Sent:.*Expires:/)

    const mail = await waitForMail(smtp, IRIS.email, 'invites you')
    link = invitationLink(mail)
    // The delivery shows once the worker has sent it (the list is read again after a resend or revoke, or on reload).
    await expect.poll(async () => {
      await page.reload()
      return row.getByTestId('mail-status').textContent()
    }).toMatch(/Sent/)
    await page.waitForFunction(() => document.documentElement.dataset.hydrated === 'true')
    await shoot(page, 'team-invitation-desktop')
    expect(await accessibilityProblems(page)).toEqual([])

    // The invalid form says why, beside the field.
    await form.getByLabel('E-mail').fill('not an address')
    await form.getByRole('button', { name: 'Send invitation' }).click()
    await expect.poll(() => form.getByTestId('field-error').first().textContent()).toMatch(/e-mail address/)
  })

  it('the invitation\'s HTML part renders as a message in Chromium, at desktop and phone widths', async () => {
    const mail = mailsTo(smtp, IRIS.email, 'invites you').at(-1)!
    for (const viewport of ['desktop', 'phone'] as const) {
      const page = await open(viewport)
      await page.setContent(mail.parsed.html as string)
      await expect.poll(() => page.getByRole('link', { name: 'Accept the invitation' }).getAttribute('href')).toBe(link)
      await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Join Larkspur Hollow Kennel on Bloomline')
      if (viewport === 'phone') await fitsThePhone(page)
      await screenshot(page, `invitation-mail-${viewport}`)
    }
  })

  it('the invitee opens the link at 360 px, sets a password, joins and lands signed in', async () => {
    const page = await open('phone')
    await gotoHydrated(page, link)
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Join Larkspur Hollow Kennel')
    await expect.poll(() => page.getByTestId('invite-email').textContent()).toBe(IRIS.email)
    await fitsThePhone(page)
    await shoot(page, 'invite-accept-phone')
    expect(await accessibilityProblems(page)).toEqual([])

    await expect.poll(() => page.getByLabel('Your name').inputValue()).toBe(IRIS.name)
    await page.getByLabel('Choose a password').fill('short')
    await page.getByTestId('invite-join').click()
    await expect.poll(() => page.getByTestId('field-error').textContent()).toMatch(/at least 8 characters/)
    await page.getByLabel('Choose a password').fill(IRIS.password)
    await page.getByTestId('invite-join').click()
    await page.waitForURL(`${baseUrl}/`)
    // An assistant's home: their own tasks first (signed in, in the kennel).
    await expect.poll(() => page.getByTestId('tasks-now').isVisible()).toBe(true)
    await shoot(page, 'invite-joined-home-phone')
  })

  it('the same link a second time gives a clear page, not an error', async () => {
    const page = await open('phone')
    await gotoHydrated(page, link)
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('This invitation was already used')
    await expect.poll(() => page.getByTestId('invite-closed-message').textContent()).toMatch(/already been used to join Larkspur Hollow Kennel/)
    await shoot(page, 'invite-used-phone')
    expect(await accessibilityProblems(page)).toEqual([])
  })

  it('an expired link names the manager to ask', async () => {
    const res = await request(manager, '/api/invitations', { method: 'POST', json: { email: LATE, role: 'handler' } })
    const { invitation } = await res.json() as { invitation: InvitationView }
    const lateLink = invitationLink(await waitForMail(smtp, LATE, 'invites you'))
    await db.query(`UPDATE invitations SET expires_at = now() - interval '1 minute' WHERE id = $1`, [invitation.id])
    const page = await open('phone')
    await gotoHydrated(page, lateLink)
    await expect.poll(() => page.getByTestId('invite-closed-message').textContent()).toBe('This invitation has expired; ask Maren Oakhurst to send a new one.')
    await shoot(page, 'invite-expired-phone')
    expect(await accessibilityProblems(page)).toEqual([])
    const unknown = await open('phone')
    await gotoHydrated(unknown, `${baseUrl}/invite/${'Z'.repeat(43)}`)
    await expect.poll(() => unknown.getByTestId('invite-invalid').textContent()).toMatch(/does not work any more/)
  })

  it('the Team page with an expired invitation reads at 360 px', async () => {
    const page = await open('phone')
    await signInThroughForm(page, 'manager')
    await page.waitForURL(`${baseUrl}/`)
    await gotoHydrated(page, `${baseUrl}/team`)
    await expect.poll(() => page.locator(`[data-invitation="${LATE}"]`).getByTestId('invitation-expired').isVisible()).toBe(true)
    await fitsThePhone(page)
    await shoot(page, 'team-invitation-phone')
    expect(await accessibilityProblems(page)).toEqual([])
  })
})

describe('password reset in Chromium', () => {
  it('from "Forgot your password?" on the sign-in page to a new password, at 360 px', async () => {
    const page = await open('phone')
    await gotoHydrated(page, `${baseUrl}/signin`)
    await page.getByTestId('forgot-link').click()
    await page.waitForURL(`${baseUrl}/password/forgot`)
    await page.waitForFunction(() => document.documentElement.dataset.hydrated === 'true')
    await page.getByLabel('E-mail').fill(IRIS.email)
    await page.getByRole('button', { name: 'Send me a link' }).click()
    await expect.poll(() => page.getByTestId('forgot-answer').textContent()).toMatch(/If a Bloomline account uses that address/)
    await fitsThePhone(page)
    await shoot(page, 'password-forgot-phone')
    expect(await accessibilityProblems(page)).toEqual([])

    const mail = await waitForMail(smtp, IRIS.email, 'Reset your Bloomline password')
    const resetPage = await open('phone')
    await gotoHydrated(resetPage, linkIn(mail, `${baseUrl}/password/reset/`))
    await expect.poll(() => resetPage.getByTestId('reset-email').textContent()).toBe(IRIS.email)
    await fitsThePhone(resetPage)
    await shoot(resetPage, 'password-reset-phone')
    expect(await accessibilityProblems(resetPage)).toEqual([])
    await resetPage.getByLabel('New password', { exact: true }).fill('iris-second-password')
    await resetPage.getByTestId('reset-save').click()
    await expect.poll(() => resetPage.getByTestId('reset-done').textContent()).toMatch(/Your password is changed/)
    await shoot(resetPage, 'password-reset-done-phone')
    expect(await accessibilityProblems(resetPage)).toEqual([])
    await resetPage.getByRole('link', { name: 'Sign in' }).click()
    await resetPage.waitForURL(/\/signin/)
    await resetPage.waitForFunction(() => document.documentElement.dataset.hydrated === 'true')
    await resetPage.getByLabel('E-mail').fill(IRIS.email)
    await resetPage.getByLabel('Password').fill('iris-second-password')
    await resetPage.getByRole('button', { name: 'Sign in' }).click()
    await resetPage.waitForURL(`${baseUrl}/`)
  })
})

describe('removing a member in Chromium', () => {
  it('asks first, then the member is gone from the Team page', async () => {
    const page = await open('desktop')
    await signInThroughForm(page, 'manager')
    await page.waitForURL(`${baseUrl}/`)
    await gotoHydrated(page, `${baseUrl}/team`)
    const row = page.locator(`[data-member="${IRIS.email}"]`)
    await row.getByRole('button', { name: `Remove ${IRIS.name}` }).click()
    const dialog = page.getByTestId('remove-dialog').filter({ visible: true })
    await expect.poll(() => dialog.getByRole('heading').textContent()).toBe(`Remove ${IRIS.name}?`)
    await screenshot(page, 'team-remove-dialog-desktop')
    expect(await accessibilityProblems(page)).toEqual([])
    await dialog.getByTestId('confirm-remove').click()
    await expect.poll(() => page.getByTestId('team-notice').textContent()).toBe(`${IRIS.name} is no longer a member of Larkspur Hollow Kennel.`)
    await expect.poll(() => row.count()).toBe(0)
    await expect.poll(() => page.getByTestId('team-list').locator('li').count()).toBe(5)
  })
})
