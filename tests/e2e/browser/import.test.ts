import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { ruleSetEdition } from '../../../shared/coat'
import { decodeImportFile, MAX_IMPORT_BYTES } from '../../../shared/import'
import { accessibilityProblems, browserPerTest, gotoHydrated, type Page, screenshot, signInThroughForm } from '../helpers/browser'
import { baseUrl } from '../helpers/http'

const openFresh = browserPerTest('import')

// Semicolons, a UTF-8 byte-order mark, CRLF line ends, a quoted line break (RFC 4180 §2.6) in
// row 2's note, day-first dates (18/09/2027 can only be read day first: there is no month 18),
// and row 3 born "31/02/2025", which is no calendar date (ISO 8601: February has at most 29 days).
const MESSY = join(import.meta.dirname, '..', '..', 'fixtures', 'csv', 'good', 'wizard-messy-semicolons.csv')
const SHOW = 'Thistlecombe Autumn Open'
const ROWS = [2, 3, 4, 5, 6]

async function open(viewport: 'desktop' | 'phone', who: 'manager' | 'handler' = 'manager') {
  const page = await openFresh(viewport)
  await signInThroughForm(page, who)
  await page.waitForURL(`${baseUrl}/`)
  return page
}

const step = (page: Page) => page.getByTestId('import-step').getAttribute('data-step')
const row = (page: Page, n: number) => page.locator(`[data-testid="preview-row"][data-row="${n}"]`)
const actionsOf = (page: Page, n: number) => row(page, n).getByTestId('row-action').allTextContents().then(a => a.map(t => t.trim()))
const problemsOf = (page: Page, n: number, severity: 'error' | 'warning') => row(page, n).locator(`[data-testid="row-problem"][data-severity="${severity}"]`).allTextContents()

/** Uploads the messy file from the first step and previews it with the proposed mapping. */
async function uploadAndMap(page: Page) {
  await page.getByTestId('file-input').setInputFiles(MESSY)
  await expect.poll(() => step(page)).toBe('1')
}

async function previewAndFixRow3(page: Page) {
  await page.getByRole('button', { name: 'Preview' }).click()
  await expect.poll(() => step(page)).toBe('2')
  await expect.poll(() => problemsOf(page, 3, 'error')).toEqual([expect.stringContaining('"31/02/2025" is not a date')])
  await page.getByLabel('Row 3, date of birth: correct value').fill('28/02/2025')
  await row(page, 3).getByRole('button', { name: 'Check this value' }).click()
  await expect.poll(() => problemsOf(page, 3, 'error')).toEqual([])
}

describe('import wizard in Chromium', () => {
  it('a manager imports a messy file in four steps, fixes a date in the preview, finds the entries on the show page, and a second import changes nothing', async () => {
    const page = await open('desktop')
    await page.goto(`${baseUrl}/shows`)
    await page.getByTestId('import-link').click()
    await page.waitForURL(`${baseUrl}/import`)
    expect(await page.locator('[aria-current="step"]').textContent()).toContain('Upload')
    expect(await accessibilityProblems(page)).toEqual([])
    await screenshot(page, 'import-1-upload')

    await uploadAndMap(page)
    expect(await page.getByTestId('file-facts').textContent()).toMatch(/5 rows, 12 columns separated by semicolons, read as UTF-8; dates read day first/)
    // The byte-order mark is not part of the first header, so "Show" is recognised.
    expect(await page.getByLabel('Column “Show”', { exact: true }).inputValue()).toBe('showName')
    expect(await page.getByLabel('Column “Reg no”').inputValue()).toBe('registrationNumber')
    expect(await page.getByLabel('Column “DOB”').inputValue()).toBe('dateOfBirth')
    expect(await page.getByLabel('Column “Notes”').inputValue()).toBe('')
    // The quoted line break stays inside one cell of one row.
    expect(await page.locator('[data-column="Notes"]').textContent()).toContain('“Shy of the ring steward”')
    // 18/09/2027 settles the order, so the page does not ask.
    expect(await page.getByTestId('day-order').count()).toBe(0)
    expect(await accessibilityProblems(page)).toEqual([])
    await screenshot(page, 'import-2-map')

    await page.getByRole('button', { name: 'Preview' }).click()
    await expect.poll(() => step(page)).toBe('2')
    expect(await page.getByTestId('nothing-written').textContent()).toContain('Nothing is written yet')
    expect(await page.getByTestId('preview-row').evaluateAll(rows => rows.map(r => Number(r.getAttribute('data-row'))))).toEqual(ROWS)
    expect(await actionsOf(page, 2)).toEqual(['new dog', 'new show', 'new entry'])
    // Row 5 is the dog of row 4 in a second class; row 6 is row 2's dog by its registration number in another case.
    expect(await actionsOf(page, 5)).toEqual(['new dog', 'new show', 'new entry'])
    expect(await actionsOf(page, 6)).toEqual(['new dog', 'new show', 'new entry'])
    expect(await problemsOf(page, 3, 'error')).toEqual([expect.stringMatching(/Error in column “DOB”:.*"31\/02\/2025" is not a date/)])
    // Born 3 February 2025, 32 months old on 2 October 2027: over the KC's Puppy class, six to not
    // exceeding twelve months (The Kennel Club, Definitions of Classes; DESIGN.md §5). The warning names the edition.
    const warnings = await problemsOf(page, 6, 'warning')
    expect(warnings).toEqual([expect.stringContaining('too old for Puppy')])
    expect(warnings[0]).toContain(ruleSetEdition('KC'))
    expect(await page.getByTestId('commit').isDisabled()).toBe(true)

    await page.getByTestId('only-problems').check()
    await expect.poll(() => page.getByTestId('preview-row').count()).toBe(2)
    await page.getByTestId('only-problems').uncheck()
    await page.getByLabel('Row 3, date of birth: correct value').fill('28/02/2025')
    await row(page, 3).getByRole('button', { name: 'Check this value' }).click()
    await expect.poll(() => problemsOf(page, 3, 'error')).toEqual([])
    expect(await actionsOf(page, 3)).toEqual(['new dog', 'new show', 'new entry'])
    expect(await page.getByTestId('commit').isDisabled()).toBe(false)
    expect(await accessibilityProblems(page)).toEqual([])
    await screenshot(page, 'import-3-preview')

    await page.getByTestId('commit').click()
    await expect.poll(() => step(page)).toBe('3')
    expect(await page.getByTestId('done-shows').getByRole('link').allTextContents()).toEqual([SHOW, 'Ollerby Wire Championship'])
    expect((await page.getByTestId('done-dogs').getByRole('link').allTextContents()).sort()).toEqual(['Quince', 'Tansy', 'Wren'])
    // The history reloads after the commit; look again until it has.
    await expect.poll(() => page.getByTestId('import-history').locator('li').first().textContent()).toMatch(/wizard-messy-semicolons\.csv.*5 new entries/s)
    expect(await accessibilityProblems(page)).toEqual([])
    await screenshot(page, 'import-4-done')

    await page.getByTestId('done-shows').getByRole('link', { name: SHOW }).click()
    await page.waitForURL(/\/shows\/\d+$/)
    await expect.poll(() => page.getByTestId('entry-list').locator('[data-entry]').evaluateAll(els => els.map(e => e.getAttribute('data-entry')).sort()))
      .toEqual(['Quince', 'Tansy', 'Wren', 'Wren'])

    // The same file again, with the same fix: every row is already there.
    await gotoHydrated(page, `${baseUrl}/import`)
    await uploadAndMap(page)
    expect(await page.getByLabel('Column “Reg no”').inputValue()).toBe('registrationNumber')
    await previewAndFixRow3(page)
    for (const n of ROWS) expect(await actionsOf(page, n)).toContain('unchanged')
    expect(await page.locator('[data-count="New entries"]').textContent()).toBe('0')
    expect(await page.locator('[data-count="Unchanged"]').textContent()).toBe(String(ROWS.length))
    expect(await row(page, 3).getByTestId('row-fixed').textContent()).toContain('date of birth “28/02/2025”')

    // Leaving row 3 out this time: the history offers it back as CSV, with the file's own cell and the reason.
    await row(page, 3).getByTestId('leave-out').check()
    await expect.poll(() => page.locator('[data-count="Left out"]').textContent()).toBe('1')
    await page.getByTestId('commit').click()
    await expect.poll(() => step(page)).toBe('3')
    const download = page.getByTestId('import-history').locator('li').first().getByTestId('left-out-download')
    expect(await download.textContent()).toContain('Download the 1 left-out row')
    const csv = await (await page.request.get(new URL((await download.getAttribute('href'))!, baseUrl).toString())).text()
    expect(csv).toContain('31/02/2025')
    expect(csv).toContain('Left out by choice.')
  })

  it('the preview reads at 360 px with no sideways scrolling', async () => {
    const page = await open('phone')
    await gotoHydrated(page, `${baseUrl}/import`)
    await uploadAndMap(page)
    await page.getByRole('button', { name: 'Preview' }).click()
    await expect.poll(() => step(page)).toBe('2')
    await expect.poll(() => page.getByTestId('row-problem').count()).toBeGreaterThan(0)
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360)
    expect(await accessibilityProblems(page)).toEqual([])
    await screenshot(page, 'import-3-preview-phone')
  })

  it('when every date reads both ways, the page asks once with an example from the file, and the preview reads the file that way', async () => {
    // 05/06/2027 and 04/03/2025: no number over 12, so either order is a real date (common practice, no source).
    const csv = 'Show,Show date,Registered name,Breed,Sex,DOB,Class\r\nBriarwick Open,05/06/2027,Marrowby Sorrel Gale,Border Wirehair,Dog,04/03/2025,Open\r\n'
    const page = await open('desktop')
    await gotoHydrated(page, `${baseUrl}/import`)
    await page.getByTestId('file-input').setInputFiles({ name: 'both-ways.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) })
    await expect.poll(() => step(page)).toBe('1')
    const question = page.getByTestId('day-order')
    expect(await question.getByLabel('Day first').isChecked()).toBe(true)
    expect(await question.textContent()).toContain('Day first: “05/06/2027” is 5 June 2027')
    expect(await question.textContent()).toContain('Month first: “05/06/2027” is 6 May 2027')
    expect(await accessibilityProblems(page)).toEqual([])
    await question.getByLabel('Month first').check()
    await page.getByRole('button', { name: 'Preview' }).click()
    await expect.poll(() => step(page)).toBe('2')
    expect(await page.getByTestId('file-facts').textContent()).toContain('dates read month first')
  })

  it.each([
    // The server's own sentences (shared/import/decode.ts, parse.ts), shown as they come.
    { name: 'empty.csv', bytes: Buffer.alloc(0), sentence: 'The file is empty: there is nothing to import.' },
    { name: 'header-only.csv', bytes: Buffer.from('Show,Class\r\n'), sentence: 'The file has a header row but no rows below it: there is nothing to import.' },
  ])('a refused file ($name) gets the server\'s sentence and the page stays on the upload step', async ({ name, bytes, sentence }) => {
    const page = await open('desktop')
    await gotoHydrated(page, `${baseUrl}/import`)
    await page.getByTestId('file-input').setInputFiles({ name, mimeType: 'text/csv', buffer: bytes })
    await expect.poll(() => page.getByTestId('import-refusal').textContent()).toContain(sentence)
    expect(await step(page)).toBe('0')
  })

  it('a file over 10 MB is refused in the page with the server\'s sentence, before it is sent', async () => {
    const page = await open('desktop')
    await gotoHydrated(page, `${baseUrl}/import`)
    let sent = false
    page.on('request', (r) => { if (r.method() === 'POST' && r.url().includes('/api/imports')) sent = true })
    const size = MAX_IMPORT_BYTES + 1
    let sentence = ''
    try {
      decodeImportFile(new Uint8Array(size))
    }
    catch (error) {
      sentence = (error as Error).message
    }
    await page.getByTestId('file-input').setInputFiles({ name: 'big.csv', mimeType: 'text/csv', buffer: Buffer.alloc(size, 'a') })
    await expect.poll(() => page.getByTestId('import-refusal').textContent()).toContain(sentence)
    expect(sentence).toMatch(/up to 10 MB/)
    expect(sent).toBe(false)
  })

  it('a handler is sent away from /import and has no import link', async () => {
    const page = await open('desktop', 'handler')
    await page.goto(`${baseUrl}/shows`)
    expect(await page.getByTestId('import-link').count()).toBe(0)
    await gotoHydrated(page, `${baseUrl}/import`)
    await page.waitForURL(`${baseUrl}/`)
  })
})
