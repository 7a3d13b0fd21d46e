// `npm run bench`, third part: importing a 10,000-row entry list. On a throw-away database in the
// private cluster it makes one organisation (a manager, two handlers), generates the list with a
// seeded PRNG (2,500 dogs, each entered at 4 of 50 shows), serves the built app and times side by
// side, in each round on an emptied organisation: (a) parse + preview with the engine of
// shared/import in this process (what the organisation has read through pg, as the server reads
// it), (b) the same preview as POST /api/imports over HTTP, (c) the commit as POST
// /api/imports/commit over HTTP (which parses and checks every row again, then writes in one
// transaction), and (d) PostgreSQL's COPY ... FROM STDIN of the same file into a scratch table,
// streamed through pg's COPY protocol in 64 KB chunks. Prints medians, the ratio (c) / (d) and
// (c) by step, from the commit's own Server-Timing header. BLOOMLINE_BENCH_PROFILE=<folder>
// also writes the server's CPU profile there.
import { randomBytes } from 'node:crypto'
import { performance } from 'node:perf_hooks'
import bcrypt from 'bcryptjs'
import pg from 'pg'
import { addDays, type ISODate } from '../shared/coat'
import { toCsv } from '../shared/csv'
import { buildImportPreview, IMPORT_FIELD_LABELS, IMPORT_FIELDS, proposeMapping, readImportFile, type ImportContext, type ImportField, type Ref, type RowPlan } from '../shared/import'
import { todayInTimeZone } from '../server/utils/time'
import { freePort, median, ms, onThrowawayDatabase, setup, signedInCookie, startApp, stopApp, type BenchDatabase } from './lib/benchApp'
import { prng } from './lib/prng'

const ROWS = 10_000
const DOGS = 2_500
const SHOWS = 50
const SHOWS_PER_DOG = ROWS / DOGS
const WARM_UP = 1
const SAMPLES = 5
const TARGET_RATIO = 5
const TIME_ZONE = 'Europe/London'
const COPY_CHUNK = 64 * 1024
// Adult classes of the KC rule set (shared/coat/eligibility.ts), so no row is too young or too old.
const CLASSES = ['Open', 'Limit', 'Post Graduate', 'Graduate', 'Novice', 'Mid Limit']

const random = prng(20261201)
const int = (lo: number, hi: number) => lo + Math.floor(random() * (hi - lo + 1))
const pick = <T>(list: readonly T[]): T => list[Math.floor(random() * list.length)]!

const BREEDS = ['Tolland Wire Terrier', 'Harrowfield Terrier', 'Corrie Rough Terrier', 'Moorbank Terrier', 'Wire-coated Fenhound']
const WORDS = ['Alder', 'Briar', 'Cinder', 'Dapple', 'Ember', 'Flint', 'Gale', 'Hazel', 'Ivy', 'Kestrel', 'Linnet', 'Marram', 'Nettle', 'Oriel', 'Pippin', 'Quince', 'Rowan', 'Sedge', 'Teasel', 'Wren']

type Row = Record<ImportField, string>

/** The entry list in the import format: the engine's own field names as headers, ISO dates, class labels. */
function entryList(today: ISODate, handlerEmails: readonly string[]): string {
  const shows = Array.from({ length: SHOWS }, (_, s) => {
    const firstDay = addDays(today, 30 + s * 4)
    return { name: `Benchfield Open Show ${s + 1}`, firstDay, lastDay: addDays(firstDay, int(0, 1)), club: `Benchfield Canine Society ${1 + (s % 7)}`, place: `${pick(WORDS)} Showground`, judge: `${pick(WORDS)} Ashby; ${pick(WORDS)} Kerr`, close: addDays(firstDay, -21) }
  })
  const rows: Row[] = []
  for (let d = 0; d < DOGS; d++) {
    const dog = {
      registeredName: `Benchmoor ${pick(WORDS)} ${pick(WORDS)} ${d + 1}`,
      callName: `${pick(WORDS)} ${d + 1}`,
      registrationNumber: random() < 0.9 ? `BIM-${String(d + 1).padStart(5, '0')}` : '',
      breed: pick(BREEDS),
      sex: random() < 0.5 ? 'dog' : 'bitch',
      dateOfBirth: addDays(today, -int(2 * 365, 6 * 365)),
      ownerName: `Owner ${d + 1}`,
      ownerEmail: `owner${d + 1}@bench.example`,
    }
    const chosen = new Set<number>()
    while (chosen.size < SHOWS_PER_DOG) chosen.add(int(0, SHOWS - 1))
    for (const s of chosen) {
      const show = shows[s]!
      rows.push({
        showName: show.name, showFirstDay: show.firstDay, showLastDay: show.lastDay, club: show.club, place: show.place, judge: show.judge, entriesClose: show.close,
        ...dog,
        handlerEmail: random() < 0.7 ? pick(handlerEmails) : '',
        classCode: pick(CLASSES),
        armband: random() < 0.5 ? String(int(1, 600)) : '',
      })
    }
  }
  return toCsv(rows, IMPORT_FIELDS.map(field => ({ header: IMPORT_FIELD_LABELS[field], value: (r: Row) => r[field] })))
}

interface Generated { organisationId: number, email: string, password: string, today: ISODate, handlerEmails: string[] }

async function generate(client: pg.Client): Promise<Generated> {
  const today = todayInTimeZone(TIME_ZONE)
  const password = randomBytes(12).toString('base64url')
  const email = 'bench-import-manager@bench.example'
  const handlerEmails = ['bench-import-handler-1@bench.example', 'bench-import-handler-2@bench.example']
  const org = await client.query<{ id: number }>(`INSERT INTO organisations (name, kind, time_zone, rule_set, created_at, updated_at) VALUES ('Bench Meadow Kennel (generated)', 'kennel', $1, 'KC', now(), now()) RETURNING id`, [TIME_ZONE])
  const organisationId = org.rows[0]!.id
  const hash = await bcrypt.hash(password, 10)
  const people = await client.query<{ id: number }>(
    `INSERT INTO users (email, name, password_hash, last_organisation_id, created_at, updated_at)
     SELECT u.email, u.name, $4, $5, now(), now()
     FROM (VALUES (1, $1, 'Bench Manager'), (2, $2, 'Bench Handler One'), (3, $3, 'Bench Handler Two')) AS u(n, email, name)
     ORDER BY u.n RETURNING id`, [email, handlerEmails[0], handlerEmails[1], hash, organisationId])
  const [manager, h1, h2] = people.rows.map(r => r.id)
  await client.query(`INSERT INTO memberships (user_id, organisation_id, role, created_at, updated_at) VALUES ($1, $4, 'manager', now(), now()), ($2, $4, 'handler', now(), now()), ($3, $4, 'handler', now(), now())`, [manager, h1, h2, organisationId])
  // The same column shape as the file, typed where the file is (ISO dates), for COPY to fill.
  await client.query(`CREATE TABLE bench_import_scratch (show_name text, show_first_day date, show_last_day date, club text, place text, judge text, entries_close date,
    registered_name text, call_name text, registration_number text, breed text, sex text, date_of_birth date, owner_name text, owner_email text, handler_email text, class text, armband text)`)
  return { organisationId, email, password, today, handlerEmails }
}

/** Empties the organisation of what an import writes, so every round imports into the same state. */
async function reset(client: pg.Client, organisationId: number): Promise<void> {
  for (const table of ['entries', 'dogs', 'shows', 'imports', 'import_mappings']) await client.query(`DELETE FROM ${table} WHERE organisation_id = $1`, [organisationId])
  await client.query('TRUNCATE bench_import_scratch')
  await client.query('VACUUM ANALYZE entries, dogs, shows, bench_import_scratch')
}

/** What the preview needs of the organisation, read with the same four queries the server's loadImportContext runs. */
async function importContext(client: pg.Client, organisationId: number, today: ISODate): Promise<ImportContext> {
  const q = <T extends pg.QueryResultRow>(sql: string) => client.query<T>(sql, [organisationId]).then(r => r.rows)
  // One after another: a single pg client runs one query at a time anyway.
  const dogs = await q<ImportContext['dogs'][number]>(`SELECT id, registered_name AS "registeredName", registration_number AS "registrationNumber",
       to_char(date_of_birth, 'YYYY-MM-DD') AS "dateOfBirth", handler_id AS "handlerId", call_name AS "callName" FROM dogs WHERE organisation_id = $1`)
  const shows = await q<ImportContext['shows'][number]>(`SELECT id, name, to_char(first_day, 'YYYY-MM-DD') AS "firstDay",
       to_char(entries_close_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') AS "entriesCloseAt" FROM shows WHERE organisation_id = $1`)
  const entries = await q<ImportContext['entries'][number]>(`SELECT id, show_id AS "showId", dog_id AS "dogId", class_code AS "classCode", armband, handler_id AS "handlerId" FROM entries WHERE organisation_id = $1`)
  const members = await q<ImportContext['members'][number]>('SELECT u.id AS "userId", u.email FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.organisation_id = $1')
  return { ruleSet: 'KC', today, now: new Date(), dogs, shows, entries, members }
}

/**
 * COPY ... FROM STDIN through pg's own protocol handling (pg-copy-streams is not installed): a
 * submittable query that answers the server's CopyInResponse with the data in chunks, as a
 * stream would, then CopyDone. Resolves with the rows COPY reports.
 */
function copyFrom(client: pg.Client, sql: string, data: Buffer): Promise<number> {
  return new Promise((resolve, reject) => {
    let rows = 0
    let failed: Error | null = null
    const query = {
      submit(connection: { query: (text: string) => void }) { connection.query(sql) },
      handleCopyInResponse(connection: { sendCopyFromChunk: (chunk: Buffer) => void, endCopyFrom: () => void }) {
        for (let at = 0; at < data.length; at += COPY_CHUNK) connection.sendCopyFromChunk(data.subarray(at, at + COPY_CHUNK))
        connection.endCopyFrom()
      },
      handleCommandComplete(msg: { text: string }) { rows = Number(msg.text.split(' ').pop()) },
      handleError(error: Error) { failed = error },
      handleReadyForQuery() { return failed ? reject(failed) : resolve(rows) },
      handleRowDescription() {},
      handleDataRow() {},
      handleEmptyQuery() {},
      handlePortalSuspended() {},
      handleCopyData() {},
    }
    client.query(query as unknown as pg.QueryConfig)
  })
}

/**
 * (e) The same rows written straight into dogs, shows and entries, with their keys, indexes and
 * foreign keys, in one transaction and with no checking at all: three INSERT ... SELECT FROM
 * unnest statements after one id reservation. What any commit of these rows costs the database
 * alone, to read (c) against.
 */
async function insertFloor(client: pg.Client, organisationId: number, plans: readonly RowPlan[]): Promise<number> {
  const dogs = plans.flatMap(p => p.newDog ? [p.newDog] : [])
  const shows = plans.flatMap(p => p.newShow ? [p.newShow] : [])
  const entries = plans.filter(p => p.newEntry && p.show)
  const start = performance.now()
  await client.query('BEGIN')
  const profile = await client.query<{ id: number }>('SELECT id FROM coat_profiles WHERE organisation_id = $1 AND is_default', [organisationId])
  const ids = await client.query<{ dogs: number[], shows: number[] }>(`SELECT
    (SELECT array_agg(nextval('dogs_id_seq'::regclass)::int) FROM generate_series(1, $1)) AS dogs,
    (SELECT array_agg(nextval('shows_id_seq'::regclass)::int) FROM generate_series(1, $2)) AS shows`, [dogs.length, shows.length])
  const dogIds = new Map(dogs.map((d, i) => [d.key, ids.rows[0]!.dogs[i]!]))
  const showIds = new Map(shows.map((sh, i) => [sh.key, ids.rows[0]!.shows[i]!]))
  await client.query(`INSERT INTO dogs (id, organisation_id, coat_profile_id, registered_name, call_name, registration_number, breed, sex, date_of_birth, owner_name, owner_email, handler_id, created_at, updated_at)
    SELECT u.*, now(), now() FROM unnest($1::int[], $2::int[], $3::int[], $4::text[], $5::text[], $6::text[], $7::text[], $8::text[], $9::date[], $10::text[], $11::text[], $12::int[]) AS u`,
  [[...dogIds.values()], dogs.map(() => organisationId), dogs.map(() => profile.rows[0]!.id), dogs.map(d => d.registeredName), dogs.map(d => d.callName), dogs.map(d => d.registrationNumber),
    dogs.map(d => d.breed), dogs.map(d => d.sex), dogs.map(d => d.dateOfBirth), dogs.map(d => d.ownerName), dogs.map(d => d.ownerEmail), dogs.map(d => d.handlerId)])
  await client.query(`INSERT INTO shows (id, organisation_id, name, first_day, last_day, club, place, judges, time_zone, entries_close_at, created_at, updated_at)
    SELECT u.id, $2, u.name, u.first_day, u.last_day, u.club, u.place, ARRAY(SELECT jsonb_array_elements_text(u.judges)), $3::text, (u.close + time '23:59') AT TIME ZONE $3::text, now(), now()
    FROM unnest($1::int[], $4::text[], $5::date[], $6::date[], $7::text[], $8::text[], $9::jsonb[], $10::date[]) AS u(id, name, first_day, last_day, club, place, judges, close)`,
  [[...showIds.values()], organisationId, TIME_ZONE, shows.map(sh => sh.name), shows.map(sh => sh.firstDay), shows.map(sh => sh.lastDay), shows.map(sh => sh.club), shows.map(sh => sh.place),
    shows.map(sh => JSON.stringify(sh.judges)), shows.map(sh => sh.entriesCloseDate)])
  const id = (made: Map<string, number>, ref: Ref) => 'id' in ref ? ref.id : made.get(ref.key)!
  await client.query(`INSERT INTO entries (organisation_id, dog_id, show_id, class_code, armband, handler_id, created_at, updated_at)
    SELECT $1, u.*, now(), now() FROM unnest($2::int[], $3::int[], $4::text[], $5::text[], $6::int[]) AS u`,
  [organisationId, entries.map(p => id(dogIds, p.dog)), entries.map(p => id(showIds, p.show!)), entries.map(p => p.newEntry!.classCode), entries.map(p => p.newEntry!.armband), entries.map(p => p.newEntry!.handlerId)])
  await client.query('COMMIT')
  const time = performance.now() - start
  const written = await client.query<{ n: string }>('SELECT count(*) AS n FROM entries WHERE organisation_id = $1', [organisationId])
  if (Number(written.rows[0]!.n) !== ROWS) throw new Error(`The straight INSERT wrote ${written.rows[0]!.n} entries, not ${ROWS}`)
  return time
}

async function main({ name, databaseUrl, onEnd }: BenchDatabase): Promise<number> {
  const client = new pg.Client({ connectionString: databaseUrl })
  await client.connect()
  onEnd(() => client.end())
  const data = await generate(client)
  const csv = entryList(data.today, data.handlerEmails)
  const bytes = Buffer.from(csv, 'utf8')
  const body = JSON.stringify({ fileName: 'bench-entries.csv', contentBase64: bytes.toString('base64') })
  const commitBody = JSON.stringify({ fileName: 'bench-entries.csv', contentBase64: bytes.toString('base64'), commit: true })
  setup.step(`Generated a ${ROWS.toLocaleString('en-GB')}-row entry list (${(bytes.length / 1024 / 1024).toFixed(2)} MB) in ${name}.`)
  setup.buildIfStale()
  const port = await freePort(3970)
  // BLOOMLINE_BENCH_PROFILE=<folder> writes the server's CPU profile there when it stops, to see where a commit's time goes.
  const app = await startApp(port, databaseUrl, { cpuProfileDir: process.env.BLOOMLINE_BENCH_PROFILE })
  onEnd(() => stopApp(app))
  const baseUrl = `http://localhost:${port}`
  const headers = { 'cookie': await signedInCookie(baseUrl, { email: data.email, password: data.password }), 'content-type': 'application/json' }

  const times = { engine: [] as number[], preview: [] as number[], commit: [] as number[], copy: [] as number[], floor: [] as number[] }
  // The commit's own Server-Timing steps, to show where its time goes.
  const steps = new Map<string, number[]>()
  let counts: Record<string, number> = {}
  let answerBytes = 0
  setup.step(`Timing: ${WARM_UP} warm-up round, then ${SAMPLES}; each round on an emptied organisation…`)
  for (let round = 0; round < WARM_UP + SAMPLES; round++) {
    await reset(client, data.organisationId)
    const keep = round >= WARM_UP

    let start = performance.now()
    const parsed = readImportFile(new Uint8Array(bytes))
    const context = await importContext(client, data.organisationId, data.today)
    const local = buildImportPreview(parsed, context, { mapping: proposeMapping(parsed.headers) })
    const engine = performance.now() - start
    if (local.counts.withErrors || local.counts.newEntries !== ROWS) throw new Error(`The engine's preview found ${local.counts.withErrors} rows with errors and ${local.counts.newEntries} new entries`)

    start = performance.now()
    const previewRes = await fetch(`${baseUrl}/api/imports`, { method: 'POST', headers, body })
    await previewRes.text()
    const preview = performance.now() - start
    if (previewRes.status !== 200) throw new Error(`POST /api/imports answered ${previewRes.status}`)

    start = performance.now()
    const commitRes = await fetch(`${baseUrl}/api/imports/commit`, { method: 'POST', headers, body: commitBody })
    const committed = await commitRes.text()
    const commit = performance.now() - start
    if (commitRes.status !== 201) throw new Error(`POST /api/imports/commit answered ${commitRes.status}: ${committed.slice(0, 300)}`)
    counts = (JSON.parse(committed) as { counts: Record<string, number> }).counts
    const serverSteps = (commitRes.headers.get('server-timing') ?? '').split(',').map(p => p.trim().match(/^([\w.-]+);dur=([\d.]+)$/)).filter(m => m !== null)
    answerBytes = Buffer.byteLength(committed)
    const written = await client.query<{ n: string }>('SELECT count(*) AS n FROM entries WHERE organisation_id = $1', [data.organisationId])
    if (Number(written.rows[0]!.n) !== ROWS) throw new Error(`The commit wrote ${written.rows[0]!.n} entries, not ${ROWS}`)

    start = performance.now()
    const copied = await copyFrom(client, 'COPY bench_import_scratch FROM STDIN WITH (FORMAT csv, HEADER true)', Buffer.from(csv.replace(/^\uFEFF/, ''), 'utf8'))
    const copy = performance.now() - start
    if (copied !== ROWS) throw new Error(`COPY reported ${copied} rows, not ${ROWS}`)

    // The organisation emptied again (untimed), so (e) writes into the state (c) wrote into.
    await reset(client, data.organisationId)
    const floor = await insertFloor(client, data.organisationId, local.rows.map(r => r.plan!))

    if (keep) {
      times.floor.push(floor)
      times.engine.push(engine)
      times.preview.push(preview)
      times.commit.push(commit)
      times.copy.push(copy)
      for (const [, name, dur] of serverSteps) steps.set(name!, [...(steps.get(name!) ?? []), Number(dur)])
      // A name with a dot is a part of a step, given on its own; the steps alone add up to the handler's time.
      const server = serverSteps.filter(m => !m[1]!.includes('.')).reduce((sum, m) => sum + Number(m[2]), 0)
      steps.set('(outside the handler: HTTP, JSON of the answer)', [...(steps.get('(outside the handler: HTTP, JSON of the answer)') ?? []), commit - server])
    }
  }

  const m = { engine: median(times.engine), preview: median(times.preview), commit: median(times.commit), copy: median(times.copy), floor: median(times.floor) }
  const ratio = m.commit / m.copy
  const n = (value: number) => value.toLocaleString('en-GB')
  const line = (label: string, a: string, b: string) => console.log(`${label.padEnd(64)}${a.padStart(11)}${b.padStart(9)}`.trimEnd())
  console.log('')
  console.log(`Bloomline import bench: ${n(ROWS)} entry rows (${n(DOGS)} dogs × ${SHOWS_PER_DOG} of ${SHOWS} shows, ${IMPORT_FIELDS.length} columns, ${(bytes.length / 1024 / 1024).toFixed(2)} MB), KC rule set, today ${data.today}`)
  console.log(`commit wrote: ${n(counts.newDogs ?? 0)} dogs, ${n(counts.newShows ?? 0)} shows, ${n(counts.newEntries ?? 0)} entries, in one transaction; its JSON answer ${(answerBytes / 1024 / 1024).toFixed(2)} MB`)
  console.log('')
  line('', 'median', 'samples')
  line('(a) parse + preview, shared/import engine in-process', ms(m.engine), String(times.engine.length))
  line('(b) parse + preview, POST /api/imports over HTTP', ms(m.preview), String(times.preview.length))
  line('(c) commit, POST /api/imports/commit over HTTP', ms(m.commit), String(times.commit.length))
  line('(d) PostgreSQL COPY FROM STDIN, same rows, scratch table', ms(m.copy), String(times.copy.length))
  line('(e) the same rows INSERTed straight into dogs/shows/entries', ms(m.floor), String(times.floor.length))
  const met = ratio <= TARGET_RATIO
  console.log(`${'(c) / (d), medians'.padEnd(64)}${`${ratio.toFixed(2)}×`.padStart(11)}   target ≤ ${TARGET_RATIO}×: ${met ? 'met' : 'MISSED'}`)
  console.log(`${'(e) / (d): the database alone, keys, indexes and foreign keys'.padEnd(64)}${`${(m.floor / m.copy).toFixed(2)}×`.padStart(11)}   (c) − (e): ${ms(m.commit - m.floor)}`)
  if (steps.size) console.log(`(c) by step, medians (Server-Timing): ${[...steps].map(([step, values]) => `${step} ${median(values).toFixed(1)}`).join(', ')}`)
  console.log(`samples (ms): a ${times.engine.map(t => t.toFixed(0)).join(', ')}; b ${times.preview.map(t => t.toFixed(0)).join(', ')}; c ${times.commit.map(t => t.toFixed(0)).join(', ')}; d ${times.copy.map(t => t.toFixed(0)).join(', ')}; e ${times.floor.map(t => t.toFixed(0)).join(', ')}`)
  return met ? 0 : 1
}

process.exit(await onThrowawayDatabase('bloomline_bench_import', main))
