import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize'
import type { RuleSet } from '../../shared/coat'
import {
  buildImportPreview, IMPORT_FIELDS, ImportFileError, leftOutRows, proposeMapping, readImportFile, startImportPreview,
  type ImportChoices, type ImportPreviewRun, type ImportCommitView, type ImportContext, type ImportedDog, type ImportedShow, type ImportMapping, type ImportPreview, type ImportPreviewView,
  type ImportRequest, type NewDog, type NewShow, type ParsedCsv, type Ref, type RowPlan,
} from '../../shared/import'
import { ImportMappingRow, ImportRecord } from '../database/models'
import type { Caller } from './auth'
import { callerRuleSet, callerToday, ensureDefaultProfile, invalidField, kennelSequelize } from './kennel'
import { wallClockToInstant } from './time'

// One import at a time per organisation: the second waits, then sees what the first wrote.
const IMPORT_LOCK = 5_032_027

/**
 * Times the steps of one request for a Server-Timing header (W3C Server Timing), so the bench
 * and a browser's network panel can see where a commit's time goes without a profiler.
 */
export function stepTimer() {
  const steps: [name: string, ms: number][] = []
  let last = performance.now()
  return {
    /** Ends the step under way and names it. */
    step(name: string) {
      const now = performance.now()
      steps.push([name, now - last])
      last = now
    },
    /** A part of a step, named `step.part`, given on its own: the steps alone add up to the whole. */
    part(name: string, ms: number) {
      steps.push([name, ms])
    },
    /** The header value: `name;dur=ms` for each step, in order. */
    header: () => steps.map(([name, ms]) => `${name};dur=${ms.toFixed(1)}`).join(', '),
  }
}
export type StepTimer = ReturnType<typeof stepTimer>
const noTimer: StepTimer = { step() {}, part() {}, header: () => '' }

/** The file of a request, decoded and parsed; a 400 with the file's one sentence when it cannot be imported. */
export function parseRequestFile(body: ImportRequest): ReturnType<typeof readImportFile> {
  const bytes = Buffer.from(body.contentBase64, 'base64')
  try {
    return readImportFile(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.length))
  }
  catch (error) {
    if (error instanceof ImportFileError) throw invalidField('contentBase64', error.message)
    throw error
  }
}

/** The organisation's remembered mapping (empty when it has none). */
export async function rememberedMapping(caller: Caller): Promise<ImportMapping> {
  const row = await ImportMappingRow.findOne({ where: { organisationId: caller.organisationId } })
  return (row?.mapping ?? {}) as ImportMapping
}

/** Remembers a mapping for the organisation's next file. */
export async function rememberMapping(caller: Caller, mapping: ImportMapping, transaction?: Transaction): Promise<void> {
  await kennelSequelize().query(
    `INSERT INTO import_mappings (organisation_id, mapping, created_at, updated_at) VALUES (:organisationId, CAST(:mapping AS jsonb), now(), now())
     ON CONFLICT (organisation_id) DO UPDATE SET mapping = EXCLUDED.mapping, updated_at = now()`,
    { replacements: { organisationId: caller.organisationId, mapping: JSON.stringify(mapping) }, transaction },
  )
}

/** The request's mapping checked against the file's headers, or a proposal from them and the remembered one. */
export async function mappingFor(caller: Caller, body: ImportRequest, parsed: ParsedCsv): Promise<ImportMapping> {
  if (!body.mapping) return proposeMapping(parsed.headers, await rememberedMapping(caller))
  const used = new Set<string>()
  for (const field of IMPORT_FIELDS) {
    const header = body.mapping[field]
    if (header === undefined) continue
    if (!parsed.headers.includes(header)) throw invalidField(`mapping.${field}`, `The file has no column "${header}"`)
    if (used.has(header)) throw invalidField(`mapping.${field}`, `The column "${header}" is already mapped to another field`)
    used.add(header)
  }
  return body.mapping
}

/** What the organisation already has, read inside `transaction` when given (the commit's, after its lock). */
export async function loadImportContext(caller: Caller, transaction?: Transaction): Promise<ImportContext> {
  const sequelize = kennelSequelize()
  const select = <T extends object>(sql: string) => sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements: { organisationId: caller.organisationId }, transaction })
  const [dogs, shows, entries, members] = await Promise.all([
    select<ImportContext['dogs'][number]>(`SELECT id, registered_name AS "registeredName", registration_number AS "registrationNumber",
       to_char(date_of_birth, 'YYYY-MM-DD') AS "dateOfBirth", handler_id AS "handlerId", call_name AS "callName" FROM dogs WHERE organisation_id = :organisationId`),
    select<ImportContext['shows'][number]>(`SELECT id, name, to_char(first_day, 'YYYY-MM-DD') AS "firstDay",
       to_char(entries_close_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') AS "entriesCloseAt" FROM shows WHERE organisation_id = :organisationId`),
    select<ImportContext['entries'][number]>(`SELECT id, show_id AS "showId", dog_id AS "dogId", class_code AS "classCode", armband, handler_id AS "handlerId"
       FROM entries WHERE organisation_id = :organisationId`),
    select<ImportContext['members'][number]>(`SELECT u.id AS "userId", u.email FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.organisation_id = :organisationId`),
  ])
  return { ruleSet: callerRuleSet(caller) as RuleSet, today: callerToday(caller), now: new Date(), dogs, shows, entries, members }
}

/** The preview of a request's file against what the organisation has now. */
export async function previewImport(caller: Caller, body: ImportRequest) {
  const parsed = parseRequestFile(body)
  const mapping = await mappingFor(caller, body, parsed)
  const context = await loadImportContext(caller)
  const preview = buildImportPreview(parsed, context, choicesOf(body, mapping))
  return { parsed, mapping, preview }
}

/** What the request chose, as the preview engine takes it. */
function choicesOf(body: ImportRequest, mapping: ImportMapping): ImportChoices {
  return {
    mapping,
    dayOrder: body.dayFirst === undefined ? undefined : body.dayFirst ? 'day-first' : 'month-first',
    exclude: body.exclude,
    fixes: body.fixes,
  }
}

/** How the file was read and what its rows come to: the part the preview and the commit answer alike. */
function fileView(body: ImportRequest, parsed: ReturnType<typeof readImportFile>, mapping: ImportMapping, preview: ImportPreview) {
  return {
    fileName: body.fileName,
    encoding: parsed.encoding,
    delimiter: parsed.delimiter,
    headers: parsed.headers,
    mapping,
    dayOrder: preview.dayOrder,
    dayOrderFromFile: preview.dayOrderFromFile,
    counts: preview.counts,
  }
}

/** The preview as the API answers it: every row without its internal write plan. */
export function previewView(body: ImportRequest, parsed: ReturnType<typeof readImportFile>, mapping: ImportMapping, preview: ImportPreview): ImportPreviewView {
  return { ...fileView(body, parsed, mapping, preview), rows: preview.rows.map(({ plan: _plan, ...row }) => row) }
}

/**
 * An array parameter as PostgreSQL's own array text ('{1,NULL,"a\"b"}'), every element quoted
 * and escaped as pg's own serialiser does, with one test per element instead of two
 * replacements: ten thousand rows make tens of thousands of elements.
 */
function pgArray(values: readonly (string | number | null)[]): string {
  let text = '{'
  for (let i = 0; i < values.length; i++) {
    const value = values[i]
    if (i) text += ','
    if (value === null || value === undefined) text += 'NULL'
    else if (typeof value === 'number') text += String(value)
    else text += `"${NEEDS_ESCAPE.test(value) ? value.replace(ESCAPED, '\\$&') : value}"`
  }
  return `${text}}`
}
const NEEDS_ESCAPE = /["\\]/
const ESCAPED = /["\\]/g

/** What a commit has written so far: the new dogs and shows with their ids by key, and the ids of the entries it made. */
interface Written {
  dogIds: Map<string, number>
  showIds: Map<string, number>
  newDogs: NewDog[]
  newShows: NewShow[]
  createdEntries: number[]
}

// One statement writes a part of the file: new dogs and shows take fresh ids from their
// sequences (nextval in a materialised WITH, so once per row) and the part's entries name them
// by their place in the part (`dog_n`, `show_n`: an index into the new ids, not a join), or by
// id when they exist already. Each column
// travels as one array parameter and unnest turns the arrays back into rows. The entries'
// foreign keys are checked at the end of the statement, when the dogs and shows are in.
const WRITE_PART_SQL = `WITH new_dogs AS MATERIALIZED (
  SELECT nextval('dogs_id_seq'::regclass)::int AS id, d.*
  FROM unnest($3::text[], $4::text[], $5::text[], $6::text[], $7::text[], $8::date[], $9::text[], $10::text[], $11::int[])
    WITH ORDINALITY AS d(registered_name, call_name, registration_number, breed, sex, date_of_birth, owner_name, owner_email, handler_id, n)
), dogs_made AS (
  INSERT INTO dogs (id, organisation_id, coat_profile_id, registered_name, call_name, registration_number, breed, sex, date_of_birth, owner_name, owner_email, handler_id, created_at, updated_at)
  SELECT id, $1, $2, registered_name, call_name, registration_number, breed, sex, date_of_birth, owner_name, owner_email, handler_id, now(), now() FROM new_dogs
), new_shows AS MATERIALIZED (
  SELECT nextval('shows_id_seq'::regclass)::int AS id, s.*
  FROM unnest($12::text[], $13::date[], $14::date[], $15::text[], $16::text[], $17::jsonb[], $18::timestamptz[])
    WITH ORDINALITY AS s(name, first_day, last_day, club, place, judges, entries_close_at, n)
), shows_made AS (
  INSERT INTO shows (id, organisation_id, name, first_day, last_day, club, place, judges, time_zone, entries_close_at, created_at, updated_at)
  SELECT id, $1, name, first_day, last_day, club, place, ARRAY(SELECT jsonb_array_elements_text(judges)), $19, entries_close_at, now(), now() FROM new_shows
), dog_ids AS (
  SELECT coalesce(array_agg(id ORDER BY n), '{}') AS ids FROM new_dogs
), show_ids AS (
  SELECT coalesce(array_agg(id ORDER BY n), '{}') AS ids FROM new_shows
), entries_made AS (
  INSERT INTO entries (organisation_id, dog_id, show_id, class_code, armband, handler_id, created_at, updated_at)
  SELECT $1, coalesce(e.dog_id, d.ids[e.dog_n]), coalesce(e.show_id, s.ids[e.show_n]), e.class_code, e.armband, e.handler_id, now(), now()
  FROM unnest($20::int[], $21::int[], $22::int[], $23::int[], $24::text[], $25::text[], $26::int[]) AS e(dog_id, dog_n, show_id, show_n, class_code, armband, handler_id),
    dog_ids d, show_ids s
  RETURNING id
), entries_changed AS (
  UPDATE entries e SET armband = u.armband, handler_id = u.handler_id, updated_at = now()
  FROM unnest($27::int[], $28::text[], $29::int[]) AS u(id, armband, handler_id)
  WHERE e.id = u.id AND e.organisation_id = $1
  RETURNING e.id
)
SELECT (SELECT ids FROM dog_ids) AS dogs,
  (SELECT ids FROM show_ids) AS shows,
  (SELECT array_agg(id ORDER BY id) FROM entries_made) AS entries,
  (SELECT count(*) FROM entries_changed)::int AS changed`

/**
 * Builds one part's statement, then (`send`) writes it and adds what it made to `written`. The
 * building happens while the part before is still being written, so `send` fills in only the
 * ids that part made, which this part's entries may name.
 */
function preparePart(caller: Caller, profileId: number, plans: readonly RowPlan[], written: Written, transaction: Transaction): { send: () => Promise<void> } {
  const dogs: NewDog[] = []
  const shows: NewShow[] = []
  const dogPlace = new Map<string, number>()
  const showPlace = new Map<string, number>()
  for (const plan of plans) {
    if (plan.newDog && !dogPlace.has(plan.newDog.key) && !written.dogIds.has(plan.newDog.key)) dogPlace.set(plan.newDog.key, dogs.push(plan.newDog))
    if (plan.newShow && !showPlace.has(plan.newShow.key) && !written.showIds.has(plan.newShow.key)) showPlace.set(plan.newShow.key, shows.push(plan.newShow))
  }
  // A dog or show is named by id when it exists (or an earlier part made it), else by its place
  // in this part; one the part still being written makes is looked up in `send`.
  const later: { list: (number | null)[], at: number, made: Map<string, number>, key: string }[] = []
  const name = (ref: Ref, places: Map<string, number>, made: Map<string, number>, ids: (number | null)[], placeList: (number | null)[]) => {
    const place = 'key' in ref ? places.get(ref.key) ?? null : null
    const id = 'id' in ref ? ref.id : place === null ? made.get(ref.key) ?? null : null
    if ('key' in ref && place === null && id === null) later.push({ list: ids, at: ids.length, made, key: ref.key })
    ids.push(id)
    placeList.push(place)
  }
  const entry = { dogIds: [] as (number | null)[], dogPlaces: [] as (number | null)[], showIds: [] as (number | null)[], showPlaces: [] as (number | null)[], classes: [] as string[], armbands: [] as (string | null)[], handlers: [] as (number | null)[] }
  const updates = { ids: [] as number[], armbands: [] as (string | null)[], handlers: [] as (number | null)[] }
  for (const plan of plans) {
    if (plan.newEntry && plan.show) {
      name(plan.dog, dogPlace, written.dogIds, entry.dogIds, entry.dogPlaces)
      name(plan.show, showPlace, written.showIds, entry.showIds, entry.showPlaces)
      entry.classes.push(plan.newEntry.classCode)
      entry.armbands.push(plan.newEntry.armband)
      entry.handlers.push(plan.newEntry.handlerId)
    }
    if (plan.updateEntry) {
      updates.ids.push(plan.updateEntry.id)
      updates.armbands.push(plan.updateEntry.armband)
      updates.handlers.push(plan.updateEntry.handlerId)
    }
  }
  const bind: (string | number)[] = [
    caller.organisationId, profileId,
    pgArray(dogs.map(d => d.registeredName)), pgArray(dogs.map(d => d.callName)), pgArray(dogs.map(d => d.registrationNumber)),
    pgArray(dogs.map(d => d.breed)), pgArray(dogs.map(d => d.sex)), pgArray(dogs.map(d => d.dateOfBirth)),
    pgArray(dogs.map(d => d.ownerName)), pgArray(dogs.map(d => d.ownerEmail)), pgArray(dogs.map(d => d.handlerId)),
    pgArray(shows.map(s => s.name)), pgArray(shows.map(s => s.firstDay)), pgArray(shows.map(s => s.lastDay)),
    pgArray(shows.map(s => s.club)), pgArray(shows.map(s => s.place)),
    // Judges are a list per show, which unnest cannot carry as a column: each travels as JSON.
    pgArray(shows.map(s => JSON.stringify(s.judges))),
    // A date alone closes at the end of that day on the organisation's clock.
    pgArray(shows.map(s => s.entriesCloseDate ? wallClockToInstant(s.entriesCloseDate, '23:59', caller.timeZone).toISOString() : null)),
    caller.timeZone,
    '', pgArray(entry.dogPlaces), '', pgArray(entry.showPlaces),
    pgArray(entry.classes), pgArray(entry.armbands), pgArray(entry.handlers),
    pgArray(updates.ids), pgArray(updates.armbands), pgArray(updates.handlers),
  ]
  const send = async () => {
    for (const { list, at, made, key } of later) list[at] = made.get(key)!
    bind[19] = pgArray(entry.dogIds)
    bind[21] = pgArray(entry.showIds)
    const [row] = await kennelSequelize().query<{ dogs: number[], shows: number[], entries: number[] | null, changed: number }>(WRITE_PART_SQL, { bind, type: QueryTypes.SELECT, transaction })
    dogs.forEach((d, i) => written.dogIds.set(d.key, row!.dogs[i]!))
    shows.forEach((s, i) => written.showIds.set(s.key, row!.shows[i]!))
    written.newDogs.push(...dogs)
    written.newShows.push(...shows)
    for (const id of row!.entries ?? []) written.createdEntries.push(id)
  }
  return { send }
}

// Rows checked and written a part at a time: the database writes one part while this process
// checks the next, instead of the two waiting on each other. Parts are not made small: the
// foreign-key checks plan their lookups when first run, and a first part of a few hundred dogs
// in an empty table can leave a connection scanning the whole table for every later entry.
const WRITE_PART_ROWS = 2_500

/**
 * Checks every row and writes the chosen ones as it goes, inside the commit's transaction:
 * the first chosen row with an error stops the writing (what was written is rolled back with
 * the 400), and every row is still checked, so the 400 can name them all.
 */
async function checkAndWrite(caller: Caller, profileId: number, run: ImportPreviewRun, transaction: Transaction, timer: StepTimer) {
  const written: Written = { dogIds: new Map(), showIds: new Map(), newDogs: [], newShows: [], createdEntries: [] }
  let writing: Promise<void> = Promise.resolve()
  let blocked = false
  // How long the rows took to check, the statements to build, and the database to catch up.
  let checking = 0
  let building = 0
  let waiting = 0
  const read = (count: number) => {
    const start = performance.now()
    const part = run.next(count)
    checking += performance.now() - start
    return part
  }
  const wait = async (promise: Promise<void>) => {
    const start = performance.now()
    try {
      await promise
    }
    finally {
      waiting += performance.now() - start
    }
  }
  for (let part = read(WRITE_PART_ROWS); part.length; part = read(WRITE_PART_ROWS)) {
    const plans: RowPlan[] = []
    for (const r of part) {
      if (r.excluded) continue
      if (r.plan) plans.push(r.plan)
      else blocked = true
    }
    if (blocked || !plans.length) continue
    const start = performance.now()
    const statement = preparePart(caller, profileId, plans, written, transaction)
    building += performance.now() - start
    // This part's entries may name dogs and shows the part before made, so their ids must be back.
    await wait(writing)
    writing = statement.send()
    // Handled when awaited; the empty catch only keeps a failure from counting as unhandled meanwhile.
    writing.catch(() => {})
    // Lets the statement reach the database before this process reads the next part.
    await new Promise(resolve => setImmediate(resolve))
  }
  const preview = run.finish()
  if (blocked) await writing.catch(() => {})
  else await wait(writing)
  timer.part('check-and-write.check', checking)
  timer.part('check-and-write.build', building)
  timer.part('check-and-write.wait', waiting)
  return { preview, written, blocked }
}

const byText = (a: string, b: string) => a < b ? -1 : a > b ? 1 : 0

/** The commit answer: the ids of what the chosen rows made or found, by kind, and only the rows worth a second look. */
function commitView(body: ImportRequest, parsed: ReturnType<typeof readImportFile>, mapping: ImportMapping, preview: ImportPreview, context: ImportContext, written: Written, importId: number): ImportCommitView {
  const knownDogs = new Map(context.dogs.map(d => [d.id, d]))
  const knownShows = new Map(context.shows.map(s => [s.id, s]))
  const dogs = new Map<number, ImportedDog>()
  const shows = new Map<number, ImportedShow>()
  for (const d of written.newDogs) dogs.set(written.dogIds.get(d.key)!, { id: written.dogIds.get(d.key)!, callName: d.callName, created: true })
  for (const s of written.newShows) shows.set(written.showIds.get(s.key)!, { id: written.showIds.get(s.key)!, name: s.name, firstDay: s.firstDay, created: true })
  const updated: number[] = []
  const unchanged: number[] = []
  const rows: ImportCommitView['rows'] = []
  for (const row of preview.rows) {
    if (row.excluded || row.problems.length) {
      const { plan: _plan, ...shown } = row
      rows.push(shown)
    }
    const plan = row.plan
    if (row.excluded || !plan) continue
    if ('id' in plan.dog && !dogs.has(plan.dog.id)) {
      const known = knownDogs.get(plan.dog.id)!
      dogs.set(known.id, { id: known.id, callName: known.callName ?? known.registeredName, created: false })
    }
    if (plan.show && 'id' in plan.show && !shows.has(plan.show.id)) {
      const known = knownShows.get(plan.show.id)!
      shows.set(known.id, { id: known.id, name: known.name, firstDay: known.firstDay, created: false })
    }
    if (plan.updateEntry) updated.push(plan.updateEntry.id)
    if (plan.unchangedEntry) unchanged.push(plan.unchangedEntry.id)
  }
  return {
    importId,
    ...fileView(body, parsed, mapping, preview),
    dogs: [...dogs.values()].sort((a, b) => byText(a.callName, b.callName) || a.id - b.id),
    shows: [...shows.values()].sort((a, b) => byText(a.firstDay, b.firstDay) || a.id - b.id),
    entries: { created: written.createdEntries, updated, unchanged },
    rows,
  }
}

/**
 * Validates the request again from scratch and writes every chosen row in one transaction, or
 * nothing: a chosen row with an error is a 400 that names the rows, and any failure part-way
 * rolls everything back. Re-importing the same file writes no dog, show or entry.
 */
export async function commitImport(caller: Caller, body: ImportRequest, timer: StepTimer = noTimer): Promise<ImportCommitView> {
  const sequelize = kennelSequelize()
  // The file and mapping do not depend on what the organisation has: a bad file is refused before any lock is taken.
  const parsed = parseRequestFile(body)
  timer.step('parse')
  const mapping = await mappingFor(caller, body, parsed)
  const profileId = await ensureDefaultProfile(caller.organisationId)
  try {
    return await sequelize.transaction(async (transaction) => {
      await sequelize.query('SELECT pg_advisory_xact_lock(:lock, :organisationId)', { replacements: { lock: IMPORT_LOCK, organisationId: caller.organisationId }, transaction })
      const context = await loadImportContext(caller, transaction)
      timer.step('context')
      const { preview, written, blocked } = await checkAndWrite(caller, profileId, startImportPreview(parsed, context, choicesOf(body, mapping)), transaction, timer)
      timer.step('check-and-write')
      if (blocked) {
        const rows = preview.rows.filter(r => !r.excluded && !r.plan)
        const shown = rows.slice(0, 10).map(r => r.row).join(', ')
        throw createError({
          statusCode: 400,
          statusMessage: 'Bad Request',
          message: `Row${rows.length > 1 ? 's' : ''} ${shown}${rows.length > 10 ? ` and ${rows.length - 10} more` : ''} still ha${rows.length > 1 ? 've' : 's'} problems: fix ${rows.length > 1 ? 'them' : 'it'} or leave ${rows.length > 1 ? 'them' : 'it'} out. Nothing was imported.`,
          data: { rows: rows.map(r => ({ row: r.row, problems: r.problems.filter(p => p.severity === 'error') })) },
        })
      }
      const record = await ImportRecord.create({
        organisationId: caller.organisationId,
        userId: caller.userId,
        fileName: body.fileName,
        counts: preview.counts,
        mapping,
        leftOut: { headers: parsed.headers, rows: leftOutRows(parsed, preview.rows) },
      }, { transaction })
      await rememberMapping(caller, mapping, transaction)
      timer.step('record')
      const view = commitView(body, parsed, mapping, preview, context, written, record.id)
      timer.step('answer')
      return view
    }).finally(() => timer.step('commit'))
  }
  catch (error) {
    if (error instanceof UniqueConstraintError) {
      throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'Something in the file was added by someone else while importing; nothing was imported. Preview the file again.' })
    }
    if ((error as { statusCode?: number }).statusCode) throw error
    throw createError({ statusCode: 500, statusMessage: 'Internal Server Error', message: 'The import failed part-way and was undone: nothing was imported. Try again; if it fails again, tell us the file name.' })
  }
}
