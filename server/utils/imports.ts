import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize'
import type { RuleSet } from '../../shared/coat'
import {
  buildImportPreview, IMPORT_FIELDS, ImportFileError, leftOutRows, proposeMapping, readImportFile,
  type ImportContext, type ImportMapping, type ImportPreview, type ImportPreviewView, type ImportRequest, type NewDog, type NewShow, type ParsedCsv, type Ref, type RowPlan,
} from '../../shared/import'
import { ImportMappingRow, ImportRecord } from '../database/models'
import type { Caller } from './auth'
import { callerRuleSet, callerToday, ensureDefaultProfile, invalidField, kennelSequelize } from './kennel'
import { wallClockToInstant } from './time'

// One import at a time per organisation: the second waits, then sees what the first wrote.
const IMPORT_LOCK = 5_032_027

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
       to_char(date_of_birth, 'YYYY-MM-DD') AS "dateOfBirth", handler_id AS "handlerId" FROM dogs WHERE organisation_id = :organisationId`),
    select<ImportContext['shows'][number]>(`SELECT id, name, to_char(first_day, 'YYYY-MM-DD') AS "firstDay",
       to_char(entries_close_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') AS "entriesCloseAt" FROM shows WHERE organisation_id = :organisationId`),
    select<ImportContext['entries'][number]>(`SELECT id, show_id AS "showId", dog_id AS "dogId", class_code AS "classCode", armband, handler_id AS "handlerId"
       FROM entries WHERE organisation_id = :organisationId`),
    select<ImportContext['members'][number]>(`SELECT u.id AS "userId", u.email FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.organisation_id = :organisationId`),
  ])
  return { ruleSet: callerRuleSet(caller) as RuleSet, today: callerToday(caller), now: new Date(), dogs, shows, entries, members }
}

/** The preview of a request's file against what the organisation has now. */
export async function previewImport(caller: Caller, body: ImportRequest, transaction?: Transaction) {
  const parsed = parseRequestFile(body)
  const mapping = await mappingFor(caller, body, parsed)
  const context = await loadImportContext(caller, transaction)
  const preview = buildImportPreview(parsed, context, {
    mapping,
    dayOrder: body.dayFirst === undefined ? undefined : body.dayFirst ? 'day-first' : 'month-first',
    exclude: body.exclude,
    fixes: body.fixes,
  })
  return { parsed, mapping, preview }
}

/** The preview as the API answers it: every row without its internal write plan. */
export function previewView(body: ImportRequest, parsed: ReturnType<typeof readImportFile>, mapping: ImportMapping, preview: ImportPreview): ImportPreviewView {
  return {
    fileName: body.fileName,
    encoding: parsed.encoding,
    delimiter: parsed.delimiter,
    headers: parsed.headers,
    mapping,
    dayOrder: preview.dayOrder,
    dayOrderFromFile: preview.dayOrderFromFile,
    rows: preview.rows.map(({ plan: _plan, ...row }) => row),
    counts: preview.counts,
  }
}

function ids(refs: Map<string, number>, ref: Ref): number {
  return 'id' in ref ? ref.id : refs.get(ref.key)!
}

/** One column of a set-based write: its name, its PostgreSQL type and a value per row. */
type Column = [name: string, type: string, values: readonly unknown[]]

/**
 * Writes many rows with one INSERT … SELECT FROM unnest: each column travels as one array
 * parameter, so ten thousand rows are one statement rather than ten thousand.
 */
async function insertRows(table: string, columns: readonly Column[], transaction: Transaction): Promise<void> {
  if (!columns[0]![2].length) return
  await kennelSequelize().query(
    `INSERT INTO ${table} (${columns.map(([name]) => name).join(', ')}, created_at, updated_at)
     SELECT *, now(), now() FROM unnest(${columns.map(([, type], i) => `$${i + 1}::${type}[]`).join(', ')})`,
    { bind: columns.map(([, , values]) => values), transaction },
  )
}

/** `count` fresh ids from a table's own sequence, so new rows can be referred to before they are written. */
async function reserveIds(table: string, count: number, transaction: Transaction): Promise<number[]> {
  if (!count) return []
  const rows = await kennelSequelize().query<{ id: number }>(
    `SELECT nextval(pg_get_serial_sequence($1, 'id'))::int AS id FROM generate_series(1, $2)`,
    { bind: [table, count], type: QueryTypes.SELECT, transaction },
  )
  return rows.map(r => r.id)
}

/** Writes a commit's plans: new dogs and shows first (their ids reserved), then entries, then changed entries. */
async function writePlans(caller: Caller, profileId: number, plans: readonly RowPlan[], transaction: Transaction): Promise<void> {
  const newDogs = new Map<string, NewDog>()
  const newShows = new Map<string, NewShow>()
  for (const plan of plans) {
    if (plan.newDog && !newDogs.has(plan.newDog.key)) newDogs.set(plan.newDog.key, plan.newDog)
    if (plan.newShow && !newShows.has(plan.newShow.key)) newShows.set(plan.newShow.key, plan.newShow)
  }
  const dogs = [...newDogs.values()]
  const shows = [...newShows.values()]
  const [dogIds, showIds] = await Promise.all([reserveIds('dogs', dogs.length, transaction), reserveIds('shows', shows.length, transaction)])
  const dogRefs = new Map(dogs.map((d, i) => [d.key, dogIds[i]!]))
  const showRefs = new Map(shows.map((s, i) => [s.key, showIds[i]!]))
  const each = <T>(list: readonly T[], value: unknown) => list.map(() => value)

  await insertRows('dogs', [
    ['id', 'int', dogIds],
    ['organisation_id', 'int', each(dogs, caller.organisationId)],
    ['coat_profile_id', 'int', each(dogs, profileId)],
    ['registered_name', 'text', dogs.map(d => d.registeredName)],
    ['call_name', 'text', dogs.map(d => d.callName)],
    ['registration_number', 'text', dogs.map(d => d.registrationNumber)],
    ['breed', 'text', dogs.map(d => d.breed)],
    ['sex', 'text', dogs.map(d => d.sex)],
    ['date_of_birth', 'date', dogs.map(d => d.dateOfBirth)],
    ['owner_name', 'text', dogs.map(d => d.ownerName)],
    ['owner_email', 'text', dogs.map(d => d.ownerEmail)],
    ['handler_id', 'int', dogs.map(d => d.handlerId)],
  ], transaction)
  if (shows.length) {
    // Judges are a list per show, which unnest cannot carry as a column: each travels as JSON.
    await kennelSequelize().query(
      `INSERT INTO shows (id, organisation_id, name, first_day, last_day, club, place, judges, time_zone, entries_close_at, created_at, updated_at)
       SELECT s.id, $2, s.name, s.first_day, s.last_day, s.club, s.place, ARRAY(SELECT jsonb_array_elements_text(s.judges)), $3, s.entries_close_at, now(), now()
       FROM unnest($1::int[], $4::text[], $5::date[], $6::date[], $7::text[], $8::text[], $9::jsonb[], $10::timestamptz[])
         AS s(id, name, first_day, last_day, club, place, judges, entries_close_at)`,
      {
        bind: [
          showIds, caller.organisationId, caller.timeZone,
          shows.map(s => s.name), shows.map(s => s.firstDay), shows.map(s => s.lastDay), shows.map(s => s.club), shows.map(s => s.place),
          shows.map(s => JSON.stringify(s.judges)),
          // A date alone closes at the end of that day on the organisation's clock.
          shows.map(s => s.entriesCloseDate ? wallClockToInstant(s.entriesCloseDate, '23:59', caller.timeZone).toISOString() : null),
        ],
        transaction,
      },
    )
  }
  const entries = plans.filter(p => p.newEntry && p.show)
  await insertRows('entries', [
    ['organisation_id', 'int', each(entries, caller.organisationId)],
    ['dog_id', 'int', entries.map(p => ids(dogRefs, p.dog))],
    ['show_id', 'int', entries.map(p => ids(showRefs, p.show!))],
    ['class_code', 'text', entries.map(p => p.newEntry!.classCode)],
    ['armband', 'text', entries.map(p => p.newEntry!.armband)],
    ['handler_id', 'int', entries.map(p => p.newEntry!.handlerId)],
  ], transaction)
  const updates = plans.flatMap(p => p.updateEntry ? [p.updateEntry] : [])
  if (updates.length) {
    await kennelSequelize().query(
      `UPDATE entries e SET armband = u.armband, handler_id = u.handler_id, updated_at = now()
       FROM unnest($1::int[], $2::text[], $3::int[]) AS u(id, armband, handler_id)
       WHERE e.id = u.id AND e.organisation_id = $4`,
      { bind: [updates.map(u => u.id), updates.map(u => u.armband), updates.map(u => u.handlerId), caller.organisationId], transaction },
    )
  }
}

/**
 * Validates the request again from scratch and writes every chosen row in one transaction, or
 * nothing: a chosen row with an error is a 400 that names the rows, and any failure part-way
 * rolls everything back. Re-importing the same file writes no dog, show or entry.
 */
export async function commitImport(caller: Caller, body: ImportRequest) {
  const sequelize = kennelSequelize()
  const profileId = await ensureDefaultProfile(caller.organisationId)
  try {
    return await sequelize.transaction(async (transaction) => {
      await sequelize.query('SELECT pg_advisory_xact_lock(:lock, :organisationId)', { replacements: { lock: IMPORT_LOCK, organisationId: caller.organisationId }, transaction })
      const { parsed, mapping, preview } = await previewImport(caller, body, transaction)
      const chosen = preview.rows.filter(r => !r.excluded)
      const blocked = chosen.filter(r => !r.plan)
      if (blocked.length) {
        const shown = blocked.slice(0, 10).map(r => r.row).join(', ')
        throw createError({
          statusCode: 400,
          statusMessage: 'Bad Request',
          message: `Row${blocked.length > 1 ? 's' : ''} ${shown}${blocked.length > 10 ? ` and ${blocked.length - 10} more` : ''} still ha${blocked.length > 1 ? 've' : 's'} problems: fix ${blocked.length > 1 ? 'them' : 'it'} or leave ${blocked.length > 1 ? 'them' : 'it'} out. Nothing was imported.`,
          data: { rows: blocked.map(r => ({ row: r.row, problems: r.problems.filter(p => p.severity === 'error') })) },
        })
      }
      await writePlans(caller, profileId, chosen.map(r => r.plan!), transaction)
      const record = await ImportRecord.create({
        organisationId: caller.organisationId,
        userId: caller.userId,
        fileName: body.fileName,
        counts: preview.counts,
        mapping,
        leftOut: { headers: parsed.headers, rows: leftOutRows(parsed, preview.rows) },
      }, { transaction })
      await rememberMapping(caller, mapping, transaction)
      return { ...previewView(body, parsed, mapping, preview), importId: record.id }
    })
  }
  catch (error) {
    if (error instanceof UniqueConstraintError) {
      throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'Something in the file was added by someone else while importing; nothing was imported. Preview the file again.' })
    }
    if ((error as { statusCode?: number }).statusCode) throw error
    throw createError({ statusCode: 500, statusMessage: 'Internal Server Error', message: 'The import failed part-way and was undone: nothing was imported. Try again; if it fails again, tell us the file name.' })
  }
}
