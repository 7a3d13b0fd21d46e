import type { H3Event } from 'h3'
import { UniqueConstraintError, type Sequelize, type Transaction } from 'sequelize'
import type { z } from 'zod'
import { CLASS_DEFINITIONS, DEFAULT_PROFILE, planWorkBack, type ISODate, type RuleSet } from '../../shared/coat'
import { idParamSchema } from '../../shared/schemas/organisation'
import type { DogSummary, ProfileView } from '../../shared/types/kennel'
import type { CoatProfileRow } from '../database/models'
import type { Caller } from './auth'
import { loadDogRecords, loadLiveShows, loadProfileDogCounts, loadProfiles, loadPullWork, readinessFor, selectRows, type DogRecord, type SqlWhere, type StoredProfile } from './kennelData'
import { classDefinition, dogSummaryView, dogView, entryView, mayEditWork, profileView, showView, type EntryRecord, type ShowRecord, type WorkRecord } from './kennelViews'
import { dogScopeCondition, entryScopeCondition, LIVE_STATUSES_SQL, showScopeCondition } from './scope'
import { todayInTimeZone, wallClockToInstant } from './time'

/** The largest id a PostgreSQL integer column holds; a larger one cannot name a row. */
export const MAX_ROW_ID = 2_147_483_647

// PostgreSQL refuses these outright (a 500 if they reached it), so they are a 400 first.
const YEAR_RANGE = [1900, 2199] as const
const DATE_FIELDS = new Set(['date', 'dateOfBirth', 'firstDay', 'lastDay', 'entriesCloseDate', 'from', 'to'])

/** A 400 that names one field, in the shape the forms map back onto their inputs. */
export function invalidField(field: string, message: string) {
  return createError({ statusCode: 400, statusMessage: 'Bad Request', message: `${field}: ${message}`, data: { fields: { [field]: message } } })
}

/** A 409 with a sentence that says what to do instead. */
export function conflict(message: string) {
  return createError({ statusCode: 409, statusMessage: 'Conflict', message })
}

function checkStorable(value: unknown, path: string[]): void {
  if (typeof value === 'string') {
    const field = path.join('.') || '(body)'
    if (value.includes('\u0000')) throw invalidField(field, 'Text may not contain a NUL character')
    const key = path[path.length - 1]
    if (key && DATE_FIELDS.has(key) && /^\d{4}-/.test(value)) {
      const year = Number(value.slice(0, 4))
      if (year < YEAR_RANGE[0] || year > YEAR_RANGE[1]) throw invalidField(field, `Expected a date between ${YEAR_RANGE[0]} and ${YEAR_RANGE[1]}`)
    }
  }
  else if (Array.isArray(value)) value.forEach((v, i) => checkStorable(v, [...path, String(i)]))
  else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) checkStorable(v, [...path, k])
}

/** The body checked against a schema, then for text and dates PostgreSQL cannot store (400 naming the field). */
export async function readKennelBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.infer<S>> {
  const body = await readBodyWith(event, schema)
  checkStorable(body, [])
  return body
}

/** The query checked against a schema, then for text and dates PostgreSQL cannot store (400 naming the parameter). */
export async function readKennelQuery<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.infer<S>> {
  const query = await queryWith(event, schema)
  checkStorable(query, [])
  return query
}

/** The route's numeric id (400 when it is not one); an id no row can have is a 404 for `what`. */
export async function readRecordId(event: H3Event, what: string): Promise<number> {
  const { id } = await paramsWith(event, idParamSchema)
  if (id > MAX_ROW_ID) throw notFound(what)
  return id
}

/** The process's Sequelize instance. */
export function kennelSequelize(): Sequelize {
  return useModels().sequelize
}

/** Today in the caller's organisation's time zone. */
export function callerToday(caller: Caller): ISODate {
  return todayInTimeZone(caller.timeZone)
}

/** The organisation's show rule set. */
export function callerRuleSet(caller: Caller): RuleSet {
  return caller.ruleSet as RuleSet
}

/** Runs a write, turning a unique-constraint violation into a 409 with the given sentence. */
export async function uniquely<T>(write: () => Promise<T>, message: string): Promise<T> {
  try {
    return await write()
  }
  catch (error) {
    if (error instanceof UniqueConstraintError) throw conflict(message)
    throw error
  }
}

/** The dogs matching a condition on `d` (already scoped), as summaries with each one's next show and readiness. */
export async function loadDogSummaries(caller: Caller, today: ISODate, where: SqlWhere) {
  const sequelize = kennelSequelize()
  const ids: SqlWhere = { sql: `SELECT d.id FROM dogs d WHERE ${where.sql}`, replacements: where.replacements }
  const [records, work, next, profiles] = await Promise.all([
    loadDogRecords(sequelize, where),
    loadPullWork(sequelize, ids),
    loadLiveShows(sequelize, ids, today, true),
    loadProfiles(sequelize, caller.organisationId),
  ])
  const summaries: DogSummary[] = records.map((dog) => {
    const show = next.get(dog.id)?.[0] ?? null
    const profile = profiles.get(dog.coatProfileId) ?? DEFAULT_PROFILE
    return dogSummaryView(dog, show, show ? readinessFor(profile, work.get(dog.id), show.firstDay) : null)
  })
  return { records, summaries, profiles }
}

/** A dog the caller may see, as its full view; 404 when it is another organisation's or out of their reach. */
export async function requireDogView(caller: Caller, id: number) {
  const today = callerToday(caller)
  const { records, summaries, profiles } = await loadDogSummaries(caller, today, {
    sql: `d.id = :dogId AND ${dogScopeCondition(caller, today, 'd')}`,
    replacements: { dogId: id },
  })
  const record = records[0]
  if (!record) throw notFound('dog')
  const counts = await loadProfileDogCounts(kennelSequelize(), caller.organisationId)
  const stored = profiles.get(record.coatProfileId)!
  const profile: ProfileView = profileView(stored, counts.get(stored.id) ?? 0)
  return { record, profile: stored, view: dogView(caller, summaries[0]!, record, profile) }
}

/** A dog row the caller may see; 404 otherwise. */
export async function requireDogRecord(caller: Caller, id: number, today = callerToday(caller)): Promise<DogRecord> {
  if (id > MAX_ROW_ID) throw notFound('dog')
  const [record] = await loadDogRecords(kennelSequelize(), {
    sql: `d.id = :dogId AND ${dogScopeCondition(caller, today, 'd')}`,
    replacements: { dogId: id },
  })
  if (!record) throw notFound('dog')
  return record
}

/** A coat profile of the caller's organisation. */
export async function findProfile(caller: Caller, id: number): Promise<StoredProfile | null> {
  if (id > MAX_ROW_ID) return null
  const profiles = await loadProfiles(kennelSequelize(), caller.organisationId)
  return profiles.get(id) ?? null
}

/** The id of the organisation's default coat profile, made from DEFAULT_PROFILE when it has none yet. */
export async function ensureDefaultProfile(organisationId: number): Promise<number> {
  const sequelize = kennelSequelize()
  const find = async () => (await selectRows<{ id: number }>(sequelize,
    'SELECT id FROM coat_profiles WHERE organisation_id = :organisationId AND is_default ORDER BY id LIMIT 1', { organisationId }))[0]?.id
  const found = await find()
  if (found) return found
  // ON CONFLICT: two first requests at once make one default, not two (or an error).
  await sequelize.query(
    `INSERT INTO coat_profiles (organisation_id, key, label, tolerance_days, on_track_score, regions, is_default, created_at, updated_at)
     VALUES (:organisationId, :key, :label, :toleranceDays, :onTrackScore, CAST(:regions AS jsonb), true, now(), now())
     ON CONFLICT (organisation_id, key) DO UPDATE SET is_default = true
       WHERE NOT EXISTS (SELECT 1 FROM coat_profiles p WHERE p.organisation_id = :organisationId AND p.is_default)`,
    { replacements: { organisationId, ...DEFAULT_PROFILE, regions: JSON.stringify(DEFAULT_PROFILE.regions) } },
  )
  return (await find())!
}

/** A 400 naming `field` unless `userId` is a member of the caller's organisation. */
export async function requireMember(caller: Caller, userId: number, field: string): Promise<void> {
  const found = userId <= MAX_ROW_ID && await useModels().Membership.count({ where: { userId, organisationId: caller.organisationId } })
  if (!found) throw invalidField(field, 'Not a member of this organisation')
}

const WORK_COLUMNS = `w.id, w.dog_id AS "dogId", w.date, w.kind, w.regions,
  w.worked_by_id AS "workedById", wu.name AS "workedByName", w.recorded_by_id AS "recordedById", ru.name AS "recordedByName",
  w.minutes, w.notes, w.task_id AS "taskId", w.created_at AS "createdAt", w.updated_at AS "updatedAt",
  w.deleted_at AS "deletedAt", w.deleted_by_id AS "deletedById", du.name AS "deletedByName"`

/** Coat work (alias `w`) matching a condition, newest first, with the names of the people on it. */
export function loadWorkRecords(where: SqlWhere): Promise<WorkRecord[]> {
  return selectRows<WorkRecord>(kennelSequelize(),
    `SELECT ${WORK_COLUMNS} FROM coat_work w
     LEFT JOIN users wu ON wu.id = w.worked_by_id LEFT JOIN users ru ON ru.id = w.recorded_by_id LEFT JOIN users du ON du.id = w.deleted_by_id
     WHERE ${where.sql} ORDER BY w.date DESC, w.id DESC`, where.replacements)
}

/** Shows (alias `s`) matching a condition, each with the live entries the caller may see. */
export function loadShowRecords(caller: Caller, today: ISODate, where: SqlWhere, order = 's.first_day, s.id'): Promise<(ShowRecord & { entryCount: string })[]> {
  return selectRows(kennelSequelize(),
    `SELECT s.id, s.name, s.club, s.first_day AS "firstDay", s.last_day AS "lastDay", s.place, s.judges,
       s.time_zone AS "timeZone", s.entries_close_at AS "entriesCloseAt", s.notes,
       (SELECT count(*) FROM entries e WHERE e.show_id = s.id AND e.status IN ${LIVE_STATUSES_SQL} AND ${entryScopeCondition(caller, today, 'e')}) AS "entryCount"
     FROM shows s WHERE ${where.sql} ORDER BY ${order}`, where.replacements)
}

/** Entries (alias `e`) matching a condition, with their dog, show and handler, by show date then dog. */
export function loadEntryRecords(where: SqlWhere): Promise<EntryRecord[]> {
  return selectRows<EntryRecord>(kennelSequelize(),
    `SELECT e.id, e.class_code AS "classCode", e.armband, e.status, e.handler_id AS "handlerId", u.name AS "handlerName",
       e.notes, e.created_at AS "createdAt",
       d.id AS "dogId", d.call_name AS "dogCallName", d.registered_name AS "dogRegisteredName", d.date_of_birth AS "dogDateOfBirth",
       s.id AS "showId", s.name AS "showName", s.first_day AS "showFirstDay", s.time_zone AS "showTimeZone", s.entries_close_at AS "showEntriesCloseAt"
     FROM entries e JOIN dogs d ON d.id = e.dog_id JOIN shows s ON s.id = e.show_id LEFT JOIN users u ON u.id = e.handler_id
     WHERE ${where.sql} ORDER BY s.first_day, s.id, lower(d.call_name), e.id`, where.replacements)
}

/** A 400 naming the field when a dog's handler is not a member, its coat profile is not the organisation's, or it is born after today. */
export async function checkDogFields(caller: Caller, fields: { handlerId?: number | null, coatProfileId?: number, dateOfBirth?: ISODate }): Promise<void> {
  if (fields.handlerId != null) await requireMember(caller, fields.handlerId, 'handlerId')
  if (fields.coatProfileId !== undefined && !(await findProfile(caller, fields.coatProfileId))) {
    throw invalidField('coatProfileId', 'No such coat profile in this organisation')
  }
  if (fields.dateOfBirth && fields.dateOfBirth > callerToday(caller)) throw invalidField('dateOfBirth', 'The date of birth cannot be after today')
}

/**
 * A 400 naming the field when coat work names a region the dog's profile lacks, is dated after
 * today or before the dog was born, or names someone outside the organisation as having done it.
 */
export async function checkWorkFields(
  caller: Caller,
  dog: DogRecord,
  fields: { date?: ISODate, regions?: string[], workedById?: number },
): Promise<void> {
  if (fields.regions) {
    const profile = await findProfile(caller, dog.coatProfileId)
    const keys = new Set((profile ?? DEFAULT_PROFILE).regions.map(r => r.key))
    const unknown = fields.regions.filter(r => !keys.has(r))
    if (unknown.length) throw invalidField('regions', `Not a region of ${dog.callName}'s coat profile: ${unknown.join(', ')}`)
  }
  if (fields.date) {
    if (fields.date > callerToday(caller)) throw invalidField('date', 'Coat work cannot be dated after today')
    if (fields.date < dog.dateOfBirth) throw invalidField('date', `Coat work cannot be dated before ${dog.callName} was born`)
  }
  if (fields.workedById !== undefined) await requireMember(caller, fields.workedById, 'workedById')
}

/** The strip and layer work of one dog, not deleted. */
export async function loadDogPulls(dogId: number) {
  return (await loadPullWork(kennelSequelize(), { sql: 'SELECT CAST(:dogId AS int)', replacements: { dogId } })).get(dogId) ?? []
}

/**
 * A dog the caller may see, its profile, and its work-back plan for every show it has a live entry
 * in from today, computed now from the work already done (a pull dated after today, from a clock
 * change, waits for its day). One reading for the plan page and the plan's .ics download.
 */
export async function loadDogPlan(caller: Caller, id: number) {
  const today = callerToday(caller)
  const dog = await requireDogRecord(caller, id, today)
  const [profile, pulls, shows] = await Promise.all([
    findProfile(caller, dog.coatProfileId),
    loadDogPulls(id),
    loadLiveShows(kennelSequelize(), { sql: 'SELECT CAST(:dogId AS int)', replacements: { dogId: id } }, today).then(m => m.get(id) ?? []),
  ])
  const plan = planWorkBack(profile!, pulls.filter(w => w.date <= today), shows.map(s => s.firstDay), today)
  return { today, dog, profile: profile!, shows, plan }
}

/**
 * A piece of coat work and its dog, the work locked for a change: 404 unless its dog is one the caller may see, 409
 * when it was deleted, 403 unless the caller recorded it or is a manager.
 */
export async function requireEditableWork(caller: Caller, id: number, transaction: Transaction) {
  const work = await useModels().CoatWorkRow.findOne({
    where: { id, organisationId: caller.organisationId },
    paranoid: false,
    transaction,
    lock: transaction.LOCK.UPDATE,
  })
  if (!work) throw notFound('coat work')
  const dog = await requireDogRecord(caller, work.dogId)
  if (work.deletedAt) throw conflict('This coat work was deleted; it is kept in the log for the record and cannot be changed.')
  if (!mayEditWork(caller, work)) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'Only the person who logged this coat work, or a manager, may change or delete it.' })
  }
  return { work, dog }
}

/**
 * The instant entries close, from a date and HH:mm on the show's wall clock in its time zone:
 * null when neither is given, a 400 naming the missing one when only one is, or when it falls
 * after the show's first day.
 */
export function entriesCloseInstant(date: ISODate | null | undefined, time: string | null | undefined, timeZone: string, firstDay: ISODate): Date | null {
  if (!date && !time) return null
  if (!date) throw invalidField('entriesCloseDate', 'Give the date entries close as well as the time')
  if (!time) throw invalidField('entriesCloseTime', 'Give the time entries close as well as the date')
  if (date > firstDay) throw invalidField('entriesCloseDate', 'Entries must close on or before the first day')
  return wallClockToInstant(date, time, timeZone)
}

/** A 400 naming lastDay when a show would end before it starts. */
export function checkShowDays(firstDay: ISODate, lastDay: ISODate): void {
  if (lastDay < firstDay) throw invalidField('lastDay', 'The last day cannot be before the first day')
}

/** A show of the caller's organisation that they may see, as its view; 404 otherwise. */
export async function requireShowView(caller: Caller, id: number) {
  const today = callerToday(caller)
  const [show] = id > MAX_ROW_ID
    ? []
    : await loadShowRecords(caller, today, { sql: `s.id = :showId AND ${showScopeCondition(caller, today, 's')}`, replacements: { showId: id } })
  if (!show) throw notFound('show')
  return showView(show, Number(show.entryCount))
}

/** An entry the caller may see, as its view; 404 otherwise. */
export async function requireEntryView(caller: Caller, id: number) {
  const today = callerToday(caller)
  const [entry] = id > MAX_ROW_ID
    ? []
    : await loadEntryRecords({ sql: `e.id = :entryId AND ${entryScopeCondition(caller, today, 'e')}`, replacements: { entryId: id } })
  if (!entry) throw notFound('entry')
  return entryView(entry, callerRuleSet(caller))
}

/** A 400 naming classCode unless the code is a class of the organisation's rule set. */
export function checkClassCode(caller: Caller, code: string): void {
  const ruleSet = callerRuleSet(caller)
  if (!classDefinition(ruleSet, code)) {
    throw invalidField('classCode', `Not a class of the organisation's rule set (${ruleSet}); use one of ${CLASS_DEFINITIONS[ruleSet].map(c => c.code).join(', ')}`)
  }
}

/** A coat profile model row as the loaders read it. */
export function storedProfile(row: CoatProfileRow): StoredProfile {
  return {
    id: row.id,
    key: row.key,
    label: row.label,
    toleranceDays: row.toleranceDays,
    onTrackScore: row.onTrackScore,
    regions: row.regions,
    isDefault: row.isDefault,
  }
}

/** A profile key made from a label ('Wire coat, fast neck' → 'wire-coat-fast-neck'), suffixed until no profile of the organisation has it. */
export function uniqueProfileKey(label: string, taken: ReadonlySet<string>): string {
  const base = label.toLowerCase().normalize('NFKD').replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 50) || 'profile'
  let key = base
  for (let n = 2; taken.has(key); n++) key = `${base}-${n}`
  return key
}
