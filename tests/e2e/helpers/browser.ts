import { mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { createRequire } from 'node:module'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium, type BrowserContext, type Page } from 'playwright-core'
import { afterEach } from 'vitest'
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
  // Hydrated first: a field filled before Vue listens would leave its model empty.
  await gotoHydrated(page, `${baseUrl}/signin`)
  await page.getByLabel('E-mail').fill(account.email)
  await page.getByLabel('Password').fill(password ?? account.password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/** Opens a page of the app and waits until Vue has hydrated it (app/plugins/hydrated.client.ts), so a click or a file pick is not lost. */
export async function gotoHydrated(page: Page, url: string) {
  await page.goto(url)
  await page.waitForFunction(() => document.documentElement.dataset.hydrated === 'true')
}

/**
 * Saves a full-page screenshot under tests/artifacts/screenshots. A tall page on a busy two-core
 * machine can take Chromium well over the tests' 10-second step timeout to capture; the picture is
 * for people to look at, not a check, so it gets a minute.
 */
export async function screenshot(page: Page, name: string) {
  mkdirSync(screenshotDir, { recursive: true })
  await page.screenshot({ path: join(screenshotDir, `${name}.png`), fullPage: true, timeout: 60_000 })
}

const axePath = createRequire(import.meta.url).resolve('axe-core/axe.min.js')

/**
 * The WCAG 2.x level A and AA failures axe-core finds on the page (contrast, labels, names, …),
 * one line each: axe-core is Deque's reference rule engine for WCAG checks.
 */
export async function accessibilityProblems(page: Page): Promise<string[]> {
  await page.addScriptTag({ path: axePath })
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: { id: string, help: string, nodes: { target: string[] }[] }[] }> } }).axe
    const result = await axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21aa', 'wcag22aa'] } })
    return result.violations.map(v => `${v.id}: ${v.help} (${v.nodes.map(n => n.target.join(' ')).join(', ')})`)
  })
  return violations
}

/**
 * One browser at a time for the tests of a file: `open` closes the one before, every test ends with
 * its browser closed, and a failed test leaves `<name>-failure.png` to look at beside the error.
 */
export function browserPerTest(name: string) {
  let current: Awaited<ReturnType<typeof openBrowser>> | undefined
  afterEach(async (context) => {
    if (context.task.result?.state === 'fail' && current) await screenshot(current.page, `${name}-failure`).catch(() => {})
    await current?.close()
    current = undefined
  })
  return async function open(viewport: keyof typeof VIEWPORTS = 'desktop') {
    await current?.close()
    current = await openBrowser(viewport)
    current.page.setDefaultTimeout(10_000)
    current.page.on('pageerror', error => console.error(`[page] ${error.message}`))
    return current.page
  }
}

export type { BrowserContext, Page }
