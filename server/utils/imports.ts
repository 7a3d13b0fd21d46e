import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize'
import type { RuleSet } from '../../shared/coat'
import {
  buildImportPreview, IMPORT_FIELDS, ImportFileError, leftOutRows, proposeMapping, readImportFile,
  type ImportContext, type ImportMapping, type ImportPreview, type ImportPreviewView, type ImportRequest, type NewDog, type NewShow, type ParsedCsv, type Ref,
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
      const plans = chosen.map(r => r.plan!)
      const newDogs = new Map<string, NewDog>()
      const newShows = new Map<string, NewShow>()
      for (const plan of plans) {
        if (plan.newDog && !newDogs.has(plan.newDog.key)) newDogs.set(plan.newDog.key, plan.newDog)
        if (plan.newShow && !newShows.has(plan.newShow.key)) newShows.set(plan.newShow.key, plan.newShow)
      }
      const { Dog, Show, Entry } = useModels()
      const dogIds = new Map<string, number>()
      const showIds = new Map<string, number>()
      const dogList = [...newDogs.values()]
      const madeDogs = await Dog.bulkCreate(dogList.map(({ key: _key, ...d }) => ({ ...d, organisationId: caller.organisationId, coatProfileId: profileId, colour: null, ownerPhone: null, notes: null })), { transaction, returning: ['id'] })
      madeDogs.forEach((d, i) => dogIds.set(dogList[i]!.key, d.id))
      const showList = [...newShows.values()]
      const madeShows = await Show.bulkCreate(showList.map(({ key: _key, entriesCloseDate, ...s }) => ({
        ...s,
        organisationId: caller.organisationId,
        timeZone: caller.timeZone,
        // A date alone closes at the end of that day on the organisation's clock.
        entriesCloseAt: entriesCloseDate ? wallClockToInstant(entriesCloseDate, '23:59', caller.timeZone) : null,
        notes: null,
      })), { transaction, returning: ['id'] })
      madeShows.forEach((s, i) => showIds.set(showList[i]!.key, s.id))
      const entries = plans.filter(p => p.newEntry && p.show).map(p => ({
        organisationId: caller.organisationId,
        dogId: ids(dogIds, p.dog),
        showId: ids(showIds, p.show!),
        classCode: p.newEntry!.classCode,
        armband: p.newEntry!.armband,
        handlerId: p.newEntry!.handlerId,
        notes: null,
      }))
      await Entry.bulkCreate(entries, { transaction })
      for (const p of plans) {
        if (p.updateEntry) await Entry.update({ armband: p.updateEntry.armband, handlerId: p.updateEntry.handlerId }, { where: { id: p.updateEntry.id, organisationId: caller.organisationId }, transaction })
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
