import nodemailer from 'nodemailer'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { closeSequelize } from '../../../server/database/connection'
import { stopJobs } from '../../../server/utils/jobs'
import { queueMail } from '../../../server/utils/mail'
import { mailButton, mailLayout, mailParagraph } from '../../../shared/mail/layout'
import { accessibilityProblems, browserPerTest, gotoHydrated, screenshot, signInThroughForm } from '../helpers/browser'
import { baseUrl, demoAccount } from '../helpers/http'
import { startInstance } from '../helpers/instance'
import { startSmtp } from '../helpers/smtp'

const openFresh = browserPerTest('mail')
const run = Date.now().toString(36)
let smtp: Awaited<ReturnType<typeof startSmtp>>
let organisationId: number

beforeAll(async () => {
  smtp = await startSmtp()
  const db = new pg.Client({ connectionString: process.env.DATABASE_URL })
  await db.connect()
  organisationId = (await db.query(`SELECT id FROM organisations WHERE name = 'Larkspur Hollow Kennel'`)).rows[0].id
  await db.end()
})

afterAll(async () => {
  await stopJobs()
  await closeSequelize()
  await smtp.stop()
})

describe('the mail log in Chromium', () => {
  it('shows a manager a message that failed, and sends it when they try again', async () => {
    const to = `mail-log-${run}@larkspur.example`
    smtp.behaviour.rejectRecipients = [to]
    await queueMail({
      organisationId,
      recipientUserId: null,
      to,
      kind: 'invitation',
      periodKey: `mail-log-${run}`,
      message: { subject: `Join Larkspur Hollow Kennel (${run})`, html: '<p>Hello</p>', text: 'Hello' },
    })
    const page = await openFresh('desktop')
    await signInThroughForm(page, 'manager')
    await page.waitForURL(`${baseUrl}/`)
    const row = page.getByTestId('mail-log-row').filter({ hasText: run })
    // The log polls only while messages wait, so look again until the failure shows.
    await expect.poll(async () => {
      await gotoHydrated(page, `${baseUrl}/mail`)
      return row.getAttribute('data-status')
    }, { timeout: 20_000 }).toBe('failed')
    await expect.poll(() => page.getByTestId('mail-failed-banner').isVisible()).toBe(true)
    await expect.poll(() => row.textContent()).toContain('550')
    expect(await accessibilityProblems(page)).toEqual([])
    await screenshot(page, 'mail-log-failed-1280')
    await gotoHydrated(page, `${baseUrl}/`)
    await expect.poll(() => page.getByTestId('home-mail-failed').isVisible()).toBe(true)
    await gotoHydrated(page, `${baseUrl}/mail`)

    smtp.behaviour.rejectRecipients = []
    await row.getByRole('button', { name: 'Try again' }).click()
    await smtp.waitFor(() => smtp.to(to).length > 0)
    await expect.poll(async () => {
      await gotoHydrated(page, `${baseUrl}/mail`)
      return row.getAttribute('data-status')
    }, { timeout: 20_000 }).toBe('sent')
  })

  it('reads on a phone without sideways scrolling', async () => {
    const page = await openFresh('phone')
    await signInThroughForm(page, 'manager')
    await page.waitForURL(`${baseUrl}/`)
    await gotoHydrated(page, `${baseUrl}/mail`)
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360)
    await screenshot(page, 'mail-log-360')
  })
})

describe('the demo mailbox in Chromium', () => {
  it('lists what the demo mail server received and shows the HTML and the text part', async () => {
    const port = Number(process.env.BLOOMLINE_TEST_PORT) + 9
    const smtpPort = port + 1100
    const demo = await startInstance(port, { SMTP_HOST: undefined, BLOOMLINE_JOBS: 'off', BLOOMLINE_DEMO_SMTP_PORT: String(smtpPort), NUXT_PUBLIC_DEMO_MODE: 'true' })
    try {
      const subject = `Your weekly look at the coats (${run})`
      const link = `${demo.url}/dogs`
      await nodemailer.createTransport({ host: '127.0.0.1', port: smtpPort, secure: false, ignoreTLS: true }).sendMail({
        from: 'Bloomline <bloomline@larkspur.example>',
        to: 'tobias@larkspur.example',
        subject,
        html: mailLayout({ title: 'A message for the demo mailbox', bodyHtml: mailParagraph('Three dogs are on track.') + mailButton(link, 'Open the dogs') }),
        text: `Three dogs are on track.\n\nOpen the dogs: ${link}\n`,
      })
      const page = await openFresh('desktop')
      const account = demoAccount('manager')
      await gotoHydrated(page, `${demo.url}/signin`)
      await page.getByLabel('E-mail').fill(account.email)
      await page.getByLabel('Password').fill(account.password)
      await page.getByRole('button', { name: 'Sign in' }).click()
      await page.waitForURL(`${demo.url}/`)
      await expect.poll(() => page.locator('[data-nav="/mailbox"]').first().isVisible()).toBe(true)
      await gotoHydrated(page, `${demo.url}/mailbox`)
      await page.getByRole('button', { name: new RegExp(subject.replace(/[()]/g, '\\$&')) }).click()
      const frame = page.frameLocator('[data-testid=mailbox-html]')
      await expect.poll(() => frame.getByText('Three dogs are on track.').isVisible()).toBe(true)
      expect(await accessibilityProblems(page)).toEqual([])
      await screenshot(page, 'mailbox-html-1280')
      await page.getByRole('button', { name: 'Plain text' }).click()
      await expect.poll(() => page.getByTestId('mailbox-text').getByRole('link', { name: link }).isVisible()).toBe(true)
      await screenshot(page, 'mailbox-text-1280')
    }
    finally {
      await demo.stop()
    }
  })
})
