import { mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium, type BrowserContext, type Page } from 'playwright-core'
import { baseUrl, demoAccount } from './http'
import type { Role } from '../../../shared/types/organisation'

export const screenshotDir = join(import.meta.dirname, '..', '..', 'artifacts', 'screenshots')

export const VIEWPORTS = {
  desktop: { width: 1280, height: 800 },
  phone: { width: 360, height: 780 },
} as const

/** Debian's Chromium, headless, in a fresh profile, with the flags that keep it off the network. */
export async function openBrowser(viewport: keyof typeof VIEWPORTS = 'desktop') {
  const profile = mkdtempSync(join(tmpdir(), 'bloomline-chromium-'))
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.BLOOMLINE_CHROMIUM ?? '/usr/bin/chromium',
    headless: true,
    viewport: VIEWPORTS[viewport],
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
  const page = context.pages()[0] ?? await context.newPage()
  return {
    context,
    page,
    async close() {
      await context.close()
      rmSync(profile, { recursive: true, force: true })
    },
  }
}

/** Signs in through the sign-in form, as a person would, and waits for the home page. */
export async function signInThroughForm(page: Page, roleOrEmail: Role | string, password?: string) {
  const account = demoAccount(roleOrEmail)
  await page.goto(`${baseUrl}/signin`)
  await page.getByLabel('E-mail').fill(account.email)
  await page.getByLabel('Password').fill(password ?? account.password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/** Saves a full-page screenshot under tests/artifacts/screenshots. */
export async function screenshot(page: Page, name: string) {
  mkdirSync(screenshotDir, { recursive: true })
  await page.screenshot({ path: join(screenshotDir, `${name}.png`), fullPage: true })
}

export type { BrowserContext, Page }
