// `npm run bench`, second half: the coat grid at 1,000 dogs. On a throw-away database in the
// private cluster it generates one organisation of 1,000 dogs (10 regions, 40 coat work rows and
// 5 entries a dog), serves the built app, and prints side by side (a) the raw SQL that fetches
// the grid's rows through `pg`, (b) GET /api/grid over HTTP as the manager, and (c) the /grid page
// in Chromium rendering and scrolling those rows, with its long tasks. A script, never a test.
import { randomBytes } from 'node:crypto'
import { performance } from 'node:perf_hooks'
import bcrypt from 'bcryptjs'
import pg from 'pg'
import { chromium } from 'playwright-core'
import { addDays, DEFAULT_PROFILE, type WorkKind } from '../shared/coat'
import { todayInTimeZone } from '../server/utils/time'
import { freePort, ms, onThrowawayDatabase, quantile, setup, signedInCookie, startApp, stopApp, type BenchDatabase } from './lib/benchApp'
import { prng } from './lib/prng'

const DOGS = 1_000
const WORK_PER_DOG = 40
const ENTRIES_PER_DOG = 5
const SHOWS = 40
const WARM_UP = 5
const SAMPLES = 30
const TARGET_RATIO = 3
const LONG_TASK_LIMIT_MS = 200
const TIME_ZONE = 'Europe/London'
const KEYS = DEFAULT_PROFILE.regions.map(r => r.key)

const random = prng(20260302)
const int = (lo: number, hi: number) => lo + Math.floor(random() * (hi - lo + 1))
const pick = <T>(list: readonly T[]): T => list[Math.floor(random() * list.length)]!

function someRegions(min: number, max: number): string[] {
  const shuffled = [...KEYS].sort(() => random() - 0.5)
  return shuffled.slice(0, int(min, max))
}

// The mix of a kennel's log: mostly layers and rolls, baths before work, carding and trimming
// now and then, the odd strip to the skin (as scripts/bench.ts has it).
const KIND_SHARES: [WorkKind, number][] = [['layer', 0.32], ['roll', 0.24], ['bath', 0.16], ['card', 0.12], ['trim', 0.1], ['strip', 0.06]]
function workKind(): WorkKind {
  let r = random()
  for (const [kind, share] of KIND_SHARES) if ((r -= share) < 0) return kind
  return 'layer'
}

const BREEDS = ['Wire Fox Terrier', 'Welsh Terrier', 'Lakeland Terrier', 'Border Terrier', 'Airedale Terrier', 'Irish Terrier', 'Scottish Terrier', 'Wire-haired Dachshund', 'Cairn Terrier', 'Norfolk Terrier']
const NAMES = ['Alder', 'Briar', 'Cinder', 'Dapple', 'Ember', 'Flint', 'Gale', 'Hazel', 'Ivy', 'Juno', 'Kestrel', 'Linnet', 'Marram', 'Nettle', 'Oriel', 'Pippin', 'Quince', 'Rowan', 'Sedge', 'Teasel']

/** Rows of one table as column arrays, inserted with one unnest() per chunk: fast, and no row-by-row round trips. The tables keep no default for their timestamps, so now() is written. */
async function bulkInsert(client: pg.Client, table: string, columns: Record<string, string>, rows: unknown[][]): Promise<void> {
  const names = Object.keys(columns)
  const casts = Object.values(columns)
  const CHUNK = 10_000
  for (let start = 0; start < rows.length; start += CHUNK) {
    const chunk = rows.slice(start, start + CHUNK)
    const arrays = names.map((_, c) => chunk.map(row => row[c]))
    // An array-typed column travels as its text form ('{neck,rear}') and is cast back per row.
    const selects = casts.map((cast, c) => (cast.endsWith('[]') ? `u.c${c}::${cast}` : `u.c${c}`))
    const unnest = casts.map((cast, c) => `$${c + 1}::${cast.endsWith('[]') ? 'text' : cast}[]`).join(', ')
    await client.query(
      `INSERT INTO ${table} (${names.join(', ')}, created_at, updated_at)
       SELECT ${selects.join(', ')}, now(), now() FROM unnest(${unnest}) AS u(${names.map((_, c) => `c${c}`).join(', ')})`,
      arrays,
    )
  }
}

const pgArray = (values: readonly string[]) => `{${values.join(',')}}`

interface Generated { organisationId: number, email: string, password: string, today: string, workRows: number, entryRows: number }

async function generate(databaseUrl: string): Promise<Generated> {
  const client = new pg.Client({ connectionString: databaseUrl })
  await client.connect()
  try {
    const today = todayInTimeZone(TIME_ZONE)
    const password = randomBytes(12).toString('base64url')
    const email = 'bench-manager@bench.example'
    const org = await client.query<{ id: number }>(`INSERT INTO organisations (name, kind, time_zone, rule_set, created_at, updated_at) VALUES ('Bench Hollow Kennel (generated)', 'kennel', $1, 'KC', now(), now()) RETURNING id`, [TIME_ZONE])
    const organisationId = org.rows[0]!.id
    const hash = await bcrypt.hash(password, 10)
    const people = await client.query<{ id: number }>(
      `INSERT INTO users (email, name, password_hash, last_organisation_id, created_at, updated_at)
       SELECT u.email, u.name, $2, $3, now(), now()
       FROM (VALUES (1, $1, 'Bench Manager'), (2, 'bench-handler-1@bench.example', 'Bench Handler One'), (3, 'bench-handler-2@bench.example', 'Bench Handler Two')) AS u(n, email, name)
       ORDER BY u.n RETURNING id`, [email, hash, organisationId])
    const [manager, ...handlers] = people.rows.map(r => r.id) as [number, ...number[]]
    await client.query(`INSERT INTO memberships (user_id, organisation_id, role, created_at, updated_at) VALUES ($1, $4, 'manager', now(), now()), ($2, $4, 'handler', now(), now()), ($3, $4, 'handler', now(), now())`, [manager, handlers[0], handlers[1], organisationId])

    const fast = DEFAULT_PROFILE.regions.map(r => (['head', 'ears', 'throat', 'chest', 'tail'].includes(r.key) ? { ...r, growDays: Math.max(1, r.growDays - 4) } : r))
    const profiles = await client.query<{ id: number }>(
      `INSERT INTO coat_profiles (organisation_id, key, label, tolerance_days, on_track_score, regions, is_default, created_at, updated_at)
       VALUES ($1, $2, $3, $4, $5, $6, true, now(), now()), ($1, 'fast-furnishing-wire-coat', 'Fast-furnishing wire coat', $4, $5, $7, false, now(), now())
       RETURNING id`,
      [organisationId, DEFAULT_PROFILE.key, DEFAULT_PROFILE.label, DEFAULT_PROFILE.toleranceDays, DEFAULT_PROFILE.onTrackScore, JSON.stringify(DEFAULT_PROFILE.regions), JSON.stringify(fast)])
    const [standardId, fastId] = profiles.rows.map(r => r.id) as [number, number]

    const dogRows: unknown[][] = []
    for (let i = 0; i < DOGS; i++) {
      const handler = random() < 0.85 ? pick(handlers) : null
      dogRows.push([organisationId, `${pick(NAMES)} ${i + 1}`, `Benchmoor ${pick(NAMES)} ${pick(NAMES)} ${i + 1}`, `BNC-${String(i + 1).padStart(5, '0')}`, pick(BREEDS), random() < 0.5 ? 'dog' : 'bitch',
        addDays(today, -int(200, 3000)), 'Black and tan', `Owner ${i + 1}`, `owner${i + 1}@bench.example`, handler, random() < 0.2 ? fastId : standardId, 'active'])
    }
    await bulkInsert(client, 'dogs', { organisation_id: 'int', call_name: 'text', registered_name: 'text', registration_number: 'text', breed: 'text', sex: 'text', date_of_birth: 'date', colour: 'text', owner_name: 'text', owner_email: 'text', handler_id: 'int', coat_profile_id: 'int', status: 'text' }, dogRows)
    const dogIds = (await client.query<{ id: number }>('SELECT id FROM dogs WHERE organisation_id = $1 ORDER BY id', [organisationId])).rows.map(r => r.id)

    const workRows: unknown[][] = []
    for (const dogId of dogIds) {
      for (let j = 0; j < WORK_PER_DOG; j++) {
        const kind = workKind()
        const regions = kind === 'bath' ? KEYS : kind === 'trim' ? ['head', 'ears', 'tail'] : someRegions(1, 6)
        const by = random() < 0.5 ? manager : pick(handlers)
        // One row in forty is deleted, so the queries have deleted work to leave out.
        const deleted = j === 0 ? new Date() : null
        workRows.push([organisationId, dogId, addDays(today, -int(0, 240)), kind, pgArray(regions), by, by, int(5, 60), 'Generated for the bench.', deleted, deleted ? manager : null])
      }
    }
    await bulkInsert(client, 'coat_work', { organisation_id: 'int', dog_id: 'int', date: 'date', kind: 'text', regions: 'varchar[]', worked_by_id: 'int', recorded_by_id: 'int', minutes: 'int', notes: 'text', deleted_at: 'timestamptz', deleted_by_id: 'int' }, workRows)

    const showRows: unknown[][] = []
    for (let s = 0; s < SHOWS; s++) {
      const firstDay = addDays(today, 3 + s * 3)
      showRows.push([organisationId, `Bench Show ${s + 1}`, 'Bench Canine Society', firstDay, firstDay, 'Bench Showground', pgArray(['Bench Judge']), TIME_ZONE, new Date(`${addDays(firstDay, -28)}T12:00:00Z`)])
    }
    await bulkInsert(client, 'shows', { organisation_id: 'int', name: 'text', club: 'text', first_day: 'date', last_day: 'date', place: 'text', judges: 'varchar[]', time_zone: 'text', entries_close_at: 'timestamptz' }, showRows)
    const showIds = (await client.query<{ id: number }>('SELECT id FROM shows WHERE organisation_id = $1 ORDER BY first_day', [organisationId])).rows.map(r => r.id)

    const entryRows: unknown[][] = []
    for (const dogId of dogIds) {
      const chosen = new Set<number>()
      while (chosen.size < ENTRIES_PER_DOG) chosen.add(pick(showIds))
      for (const showId of chosen) {
        const status = random() < 0.06 ? 'withdrawn' : pick(['planned', 'entered', 'confirmed'])
        entryRows.push([organisationId, dogId, showId, 'kc:open', status === 'confirmed' ? String(int(1, 400)) : null, status, random() < 0.8 ? pick(handlers) : null])
      }
    }
    await bulkInsert(client, 'entries', { organisation_id: 'int', dog_id: 'int', show_id: 'int', class_code: 'text', armband: 'text', status: 'text', handler_id: 'int' }, entryRows)
    await client.query('ANALYZE')
    return { organisationId, email, password, today, workRows: workRows.length, entryRows: entryRows.length }
  }
  finally {
    await client.end()
  }
}

// What the grid reads for a manager, written by hand: the active dogs with their handler's name,
// the organisation's profiles, the dogs' non-deleted strip and layer work (the only kinds that
// move a region's clock, DESIGN.md §4), and each dog's next show with a live entry. Run side by
// side on a pool, as the app runs its queries.
function gridSql(pool: pg.Pool, organisationId: number, today: string) {
  const activeDogs = `SELECT id FROM dogs WHERE organisation_id = $1 AND status = 'active'`
  return Promise.all([
    pool.query(`SELECT d.id, d.call_name, d.registered_name, d.registration_number, d.breed, d.sex, d.date_of_birth, d.colour, d.status,
        d.owner_name, d.owner_email, d.owner_phone, d.notes, d.handler_id, u.name AS handler_name, d.coat_profile_id
      FROM dogs d LEFT JOIN users u ON u.id = d.handler_id
      WHERE d.organisation_id = $1 AND d.status = 'active' ORDER BY lower(d.call_name), d.id`, [organisationId]),
    pool.query('SELECT id, key, label, tolerance_days, on_track_score, regions, is_default FROM coat_profiles WHERE organisation_id = $1', [organisationId]),
    pool.query(`SELECT dog_id, date, kind, regions FROM coat_work
      WHERE deleted_at IS NULL AND kind IN ('strip', 'layer') AND dog_id IN (${activeDogs})`, [organisationId]),
    pool.query(`SELECT DISTINCT ON (e.dog_id) e.dog_id, s.id, s.name, s.first_day
      FROM entries e JOIN shows s ON s.id = e.show_id
      WHERE e.status IN ('planned', 'entered', 'confirmed') AND s.first_day >= $2 AND e.dog_id IN (${activeDogs})
      ORDER BY e.dog_id, s.first_day, s.id`, [organisationId, today]),
  ])
}

async function timed(run: () => Promise<unknown>): Promise<number> {
  const start = performance.now()
  await run()
  return performance.now() - start
}

interface BrowserResult { skipped: string | null, rows: number, renderMs: number, steps: number, reachedEnd: boolean, render: number[], scroll: number[] }

// Long tasks are recorded from before the page's own scripts run, and split at the moment the
// scrolling starts: the first render, then the scroll.
const OBSERVE_LONG_TASKS = `window.__longTasks = [];
new PerformanceObserver((list) => { for (const e of list.getEntries()) window.__longTasks.push({ start: e.startTime, duration: e.duration }) })
  .observe({ type: 'longtask', buffered: true });`

// Scrolls the grid's own scroller (or the page) to the bottom in steps of 60 % of its height,
// two frames apart. A string, because tsx would wrap the functions of a live one in a helper
// the page does not have.
const SCROLL_TO_BOTTOM = `async (last) => {
  const grid = document.querySelector('[role="grid"]')
  let el = grid.parentElement
  while (el && el.scrollHeight <= el.clientHeight + 1) el = el.parentElement
  const scroller = el || document.scrollingElement
  const mark = performance.now()
  let steps = 0
  while (scroller.scrollTop + scroller.clientHeight < scroller.scrollHeight - 1 && steps < 2000) {
    scroller.scrollTop += Math.round(scroller.clientHeight * 0.6)
    steps++
    await new Promise(r => requestAnimationFrame(() => requestAnimationFrame(r)))
  }
  await new Promise(r => setTimeout(r, 500))
  return { mark, steps, reachedEnd: !!document.querySelector('[role="row"][aria-rowindex="' + last + '"]') }
}`

async function browseGrid(baseUrl: string, cookieHeader: string, executablePath: string): Promise<BrowserResult> {
  const probe = await fetch(`${baseUrl}/grid`, { headers: { cookie: cookieHeader }, redirect: 'manual' })
  if (probe.status === 404) return { skipped: 'grid page not built yet (GET /grid answers 404)', rows: 0, renderMs: 0, steps: 0, reachedEnd: false, render: [], scroll: [] }
  const browser = await chromium.launch({
    executablePath,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
  try {
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } })
    await context.addCookies(cookieHeader.split('; ').filter(Boolean).map((pair) => {
      const eq = pair.indexOf('=')
      return { name: pair.slice(0, eq), value: pair.slice(eq + 1), url: baseUrl }
    }))
    await context.addInitScript(OBSERVE_LONG_TASKS)
    const page = await context.newPage()
    const started = performance.now()
    const response = await page.goto(`${baseUrl}/grid`, { waitUntil: 'domcontentloaded' })
    if (response?.status() === 404) return { skipped: 'grid page not built yet (the page answers 404)', rows: 0, renderMs: 0, steps: 0, reachedEnd: false, render: [], scroll: [] }
    // A virtual grid keeps only the rows in view in the page; aria-rowcount (rows + header) says how many it holds.
    const grid = page.locator('[role="grid"][aria-rowcount]').first()
    await page.waitForFunction((want) => {
      const el = document.querySelector('[role="grid"][aria-rowcount]')
      return !!el && Number(el.getAttribute('aria-rowcount')) >= want && !!el.querySelector('[role="row"][aria-rowindex="2"]')
    }, DOGS, { timeout: 60_000 })
    const renderMs = performance.now() - started
    const rows = Number(await grid.getAttribute('aria-rowcount')) - 1
    await page.waitForTimeout(500)
    const scrolled = await page.evaluate(`(${SCROLL_TO_BOTTOM})(${DOGS + 1})`) as { mark: number, steps: number, reachedEnd: boolean }
    const tasks = await page.evaluate(() => (window as unknown as { __longTasks: { start: number, duration: number }[] }).__longTasks)
    return {
      skipped: null,
      rows,
      renderMs,
      steps: scrolled.steps,
      reachedEnd: scrolled.reachedEnd,
      render: tasks.filter(t => t.start < scrolled.mark).map(t => t.duration),
      scroll: tasks.filter(t => t.start >= scrolled.mark).map(t => t.duration),
    }
  }
  finally {
    await browser.close()
  }
}

const longest = (values: number[]) => (values.length ? ms(Math.max(...values)) : '-')

async function main({ name, databaseUrl, onEnd }: BenchDatabase): Promise<number> {
  let code = 0
  setup.step(`Generating ${DOGS.toLocaleString('en-GB')} dogs in ${name}…`)
  const genStart = performance.now()
  const data = await generate(databaseUrl)
  setup.step(`Generated in ${((performance.now() - genStart) / 1000).toFixed(1)} s.`)
  setup.buildIfStale()
  const executablePath = setup.ensureChromium()
  const port = await freePort(3950)
  const app = await startApp(port, databaseUrl)
  onEnd(() => stopApp(app))
  const baseUrl = `http://localhost:${port}`

  const cookie = await signedInCookie(baseUrl, { email: data.email, password: data.password })

  const first = await fetch(`${baseUrl}/api/grid`, { headers: { cookie } })
  if (!first.ok) throw new Error(`GET /api/grid answered ${first.status}: ${(await first.text()).slice(0, 200)}`)
  const body = await first.text()
  const view = JSON.parse(body) as { rows: { show: unknown }[] }
  if (view.rows.length !== DOGS) throw new Error(`GET /api/grid gave ${view.rows.length} rows, expected ${DOGS}`)

  const pool = new pg.Pool({ connectionString: databaseUrl, max: 4 })
  onEnd(() => pool.end())
  const sqlRows = await gridSql(pool, data.organisationId, data.today)
  const api = () => fetch(`${baseUrl}/api/grid`, { headers: { cookie } }).then(r => r.text())
  const sql = () => gridSql(pool, data.organisationId, data.today)
  const times = { sql: [] as number[], api: [] as number[] }
  setup.step(`Timing: ${WARM_UP} warm-up rounds, then ${SAMPLES} of each, interleaved…`)
  for (let i = 0; i < WARM_UP + SAMPLES; i++) {
    // Alternating which goes first keeps either from always running on a warmer cache.
    const order: ('sql' | 'api')[] = i % 2 === 0 ? ['sql', 'api'] : ['api', 'sql']
    for (const which of order) {
      const t = await timed(which === 'sql' ? sql : api)
      if (i >= WARM_UP) times[which].push(t)
    }
  }
  const median = { sql: quantile(times.sql, 0.5), api: quantile(times.api, 0.5) }
  const p90 = { sql: quantile(times.sql, 0.9), api: quantile(times.api, 0.9) }
  const ratio = median.api / median.sql

  const n = (value: number) => value.toLocaleString('en-GB')
  const line = (label: string, a: string, b: string, c = '') => console.log(`${label.padEnd(44)}${a.padStart(10)}${b.padStart(10)}${c.padStart(9)}`.trimEnd())
  console.log('')
  console.log(`Bloomline grid bench: ${n(DOGS)} dogs, ${KEYS.length} regions, ${n(data.workRows)} coat work rows (${WORK_PER_DOG} a dog), ${n(data.entryRows)} entries (${ENTRIES_PER_DOG} a dog) in ${SHOWS} shows; one organisation, today ${data.today}`)
  console.log(`rows the grid reads: ${n(sqlRows[0].rowCount ?? 0)} dogs, ${n(sqlRows[1].rowCount ?? 0)} profiles, ${n(sqlRows[2].rowCount ?? 0)} strip/layer work rows (not deleted), ${n(sqlRows[3].rowCount ?? 0)} next shows; /api/grid body ${n(Math.round(body.length / 1024))} KB`)
  console.log('')
  line('', 'median', 'p90', 'samples')
  line('(a) raw SQL through pg, the grid\'s rows', ms(median.sql), ms(p90.sql), String(times.sql.length))
  line('(b) GET /api/grid over HTTP, as manager', ms(median.api), ms(p90.api), String(times.api.length))
  const ratioMet = ratio <= TARGET_RATIO
  console.log(`${'(b) / (a), medians'.padEnd(44)}${`${ratio.toFixed(2)}×`.padStart(10)}   target ≤ ${TARGET_RATIO}×: ${ratioMet ? 'met' : 'MISSED'}`)
  if (!ratioMet) code = 1

  console.log('')
  setup.step('Opening /grid in Chromium at 1280×800…')
  const browsed = await browseGrid(baseUrl, cookie, executablePath)
  if (browsed.skipped) {
    console.log(`(c) Chromium: skipped, ${browsed.skipped}`)
  }
  else {
    const all = [...browsed.render, ...browsed.scroll]
    const over = all.filter(d => d > LONG_TASK_LIMIT_MS).length
    console.log(`(c) Chromium 1280×800, /grid as manager: ${n(browsed.rows)} rows shown ${ms(browsed.renderMs)} after navigation; scrolled to the bottom in ${browsed.steps} steps, last row ${browsed.reachedEnd ? 'reached' : 'NOT reached'}`)
    line('    long tasks (> 50 ms)', 'count', 'longest')
    line('    loading and first render', String(browsed.render.length), longest(browsed.render))
    line('    scrolling', String(browsed.scroll.length), longest(browsed.scroll))
    console.log(`    target, no long task over ${LONG_TASK_LIMIT_MS} ms: ${over === 0 ? 'met' : `MISSED (${over} over)`}`)
    if (over > 0 || !browsed.reachedEnd) code = 1
  }
  return code
}

process.exit(await onThrowawayDatabase('bloomline_bench', main))
