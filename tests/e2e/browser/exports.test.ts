import { readFile } from 'node:fs/promises'
import Papa from 'papaparse'
import { beforeAll, describe, expect, it } from 'vitest'
import type { DogView, EntryView, ShowView } from '../../../shared/types/kennel'
import { accessibilityProblems, browserPerTest, screenshot, signInThroughForm, type Page } from '../helpers/browser'
import { signedIn } from '../helpers/http'
import { logWork, makeDog, makeShow, ok } from '../helpers/kennelApi'

const open = browserPerTest('exports')
let dog: DogView
let show: ShowView

beforeAll(async () => {
  const manager = await signedIn('manager')
  dog = await makeDog(manager)
  show = await makeShow(manager, 35)
  await ok<EntryView>(manager, '/api/entries', 'POST', { dogId: dog.id, showId: show.id, classCode: 'kc:open', armband: '9' })
  await logWork(manager, dog.id, -2, 'layer', ['neck', 'rear'], { minutes: 15 })
})

/** Clicks a "Download CSV" link and reads the file the browser saved, without its byte-order mark. */
async function downloaded(page: Page, testId: string) {
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId(testId).click()])
  const text = (await readFile((await download.path())!, 'utf8')).replace(/^\uFEFF/, '')
  return { name: download.suggestedFilename(), rows: Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true }).data }
}

describe('Download CSV links', () => {
  it.each(['desktop', 'phone'] as const)('the show page downloads its entry list (%s)', async (viewport) => {
    const page = await open(viewport)
    await signInThroughForm(page, 'manager')
    await page.waitForURL(url => !url.pathname.startsWith('/signin'))
    await page.goto(`${page.url().replace(/\/[^/]*$/, '')}/shows/${show.id}`)
    const link = page.getByRole('link', { name: 'Download CSV' })
    await link.waitFor()
    await screenshot(page, `exports-show-${viewport}`)
    const file = await downloaded(page, 'entries-csv')
    expect(file.name).toMatch(/^entries-.+\.csv$/)
    expect(file.rows.map(r => r['Dog registered name'])).toEqual([dog.registeredName])
    expect(await accessibilityProblems(page)).toEqual([])
  })

  it('the dog page downloads its coat-work log', async () => {
    const page = await open('desktop')
    await signInThroughForm(page, 'manager')
    await page.waitForURL(url => !url.pathname.startsWith('/signin'))
    await page.goto(`${page.url().replace(/\/[^/]*$/, '')}/dogs/${dog.id}`)
    await page.getByTestId('work-csv').waitFor()
    await screenshot(page, 'exports-dog-work')
    const file = await downloaded(page, 'work-csv')
    expect(file.name).toMatch(/^coat-work-.+\.csv$/)
    // Region labels of the default coat profile (shared/coat/profile.ts).
    expect(file.rows.map(r => r.Regions)).toEqual(['Neck; Rear'])
    expect(await accessibilityProblems(page)).toEqual([])
  })
})
