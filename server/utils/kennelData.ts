import { QueryTypes, type Sequelize } from 'sequelize'
import { assessDog, DEFAULT_PROFILE, type CoatProfile, type CoatWork, type DogReadiness, type ISODate } from '../../shared/coat'
import type { DogSex, DogStatus, RegionRef, ShowRef, StoredRegion } from '../../shared/types/kennel'
import { LIVE_STATUSES_SQL } from './scope'

// Explicit imports only: the bench loads these queries outside Nitro. Every list is read with a
// few raw queries and grouped in one pass, not as a model instance per row.

/** A dog row as the raw queries read it, with its handler's name. */
export interface DogRecord {
  id: number
  callName: string
  registeredName: string
  registrationNumber: string | null
  breed: string
  sex: DogSex
  dateOfBirth: ISODate
  colour: string | null
  status: DogStatus
  ownerName: string | null
  ownerEmail: string | null
  ownerPhone: string | null
  notes: string | null
  handlerId: number | null
  handlerName: string | null
  coatProfileId: number
}

/** A coat profile row: the coat model's profile plus its id and whether it is the organisation's default. */
export interface StoredProfile extends CoatProfile {
  id: number
  regions: StoredRegion[]
  isDefault: boolean
}

/** Part of a WHERE clause and the replacements it names. */
export interface SqlWhere {
  sql: string
  replacements?: Record<string, unknown>
}

/** Rows of a raw SELECT with named replacements. */
export function selectRows<T extends object>(sequelize: Sequelize, sql: string, replacements: Record<string, unknown> = {}): Promise<T[]> {
  return sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements, raw: true })
}

const DOG_COLUMNS = `d.id, d.call_name AS "callName", d.registered_name AS "registeredName",
  d.registration_number AS "registrationNumber", d.breed, d.sex, d.date_of_birth AS "dateOfBirth", d.colour,
  d.status, d.owner_name AS "ownerName", d.owner_email AS "ownerEmail", d.owner_phone AS "ownerPhone",
  d.notes, d.handler_id AS "handlerId", u.name AS "handlerName", d.coat_profile_id AS "coatProfileId"`

/** The dogs (alias `d`) matching a condition, by call name. */
export function loadDogRecords(sequelize: Sequelize, where: SqlWhere): Promise<DogRecord[]> {
  return selectRows<DogRecord>(sequelize,
    `SELECT ${DOG_COLUMNS} FROM dogs d LEFT JOIN users u ON u.id = d.handler_id
     WHERE ${where.sql} ORDER BY lower(d.call_name), d.id`, where.replacements)
}

/**
 * The `strip` and `layer` work (not deleted) of the dogs a sub-select names, grouped by dog. Only
 * those two kinds move a region's clock (DESIGN.md §4), so readiness and plans need no other.
 */
export async function loadPullWork(sequelize: Sequelize, dogIds: SqlWhere): Promise<Map<number, CoatWork[]>> {
  const rows = await selectRows<{ dogId: number, date: ISODate, kind: CoatWork['kind'], regions: string[] }>(sequelize,
    `SELECT w.dog_id AS "dogId", w.date, w.kind, w.regions FROM coat_work w
     WHERE w.deleted_at IS NULL AND w.kind IN ('strip', 'layer') AND w.dog_id IN (${dogIds.sql})`, dogIds.replacements)
  const byDog = new Map<number, CoatWork[]>()
  for (const row of rows) {
    const list = byDog.get(row.dogId)
    if (list) list.push(row)
    else byDog.set(row.dogId, [row])
  }
  return byDog
}

/**
 * The shows on or after `today` in which the dogs a sub-select names have a live entry, each
 * dog's soonest first; with `firstOnly`, just the soonest.
 */
export async function loadLiveShows(sequelize: Sequelize, dogIds: SqlWhere, today: ISODate, firstOnly = false): Promise<Map<number, ShowRef[]>> {
  const rows = await selectRows<{ dogId: number, id: number, name: string, firstDay: ISODate }>(sequelize,
    `SELECT ${firstOnly ? 'DISTINCT ON (e.dog_id)' : 'DISTINCT'} e.dog_id AS "dogId", s.id, s.name, s.first_day AS "firstDay"
     FROM entries e JOIN shows s ON s.id = e.show_id
     WHERE e.status IN ${LIVE_STATUSES_SQL} AND s.first_day >= :today AND e.dog_id IN (${dogIds.sql})
     ORDER BY e.dog_id, s.first_day, s.id`, { ...dogIds.replacements, today })
  const byDog = new Map<number, ShowRef[]>()
  for (const { dogId, ...show } of rows) {
    const list = byDog.get(dogId)
    if (list) list.push(show)
    else byDog.set(dogId, [show])
  }
  return byDog
}

/** Every coat profile of an organisation, by id. */
export async function loadProfiles(sequelize: Sequelize, organisationId: number): Promise<Map<number, StoredProfile>> {
  const rows = await selectRows<StoredProfile>(sequelize,
    `SELECT id, key, label, tolerance_days AS "toleranceDays", on_track_score AS "onTrackScore", regions, is_default AS "isDefault"
     FROM coat_profiles WHERE organisation_id = :organisationId ORDER BY is_default DESC, id`, { organisationId })
  return new Map(rows.map(p => [p.id, p]))
}

/** How many dogs of an organisation use each profile. */
export async function loadProfileDogCounts(sequelize: Sequelize, organisationId: number): Promise<Map<number, number>> {
  const rows = await selectRows<{ id: number, count: string }>(sequelize,
    'SELECT coat_profile_id AS id, count(*) AS count FROM dogs WHERE organisation_id = :organisationId GROUP BY coat_profile_id', { organisationId })
  return new Map(rows.map(r => [r.id, Number(r.count)]))
}

/** A profile's regions as the views name them. */
export function regionRefs(profile: CoatProfile): RegionRef[] {
  return profile.regions.map(r => ({ key: r.key, label: r.label }))
}

/**
 * The region columns of several profiles: the default profile's regions in its order, then any
 * other profile's further regions in the order they first appear (profiles by id).
 */
export function unionRegions(profiles: Iterable<StoredProfile>): RegionRef[] {
  const list = [...profiles].sort((a, b) => Number(b.isDefault) - Number(a.isDefault) || a.id - b.id)
  const first = list[0]?.isDefault ? list : [DEFAULT_PROFILE, ...list]
  const seen = new Map<string, RegionRef>()
  for (const profile of first) {
    for (const r of profile.regions) if (!seen.has(r.key)) seen.set(r.key, { key: r.key, label: r.label })
  }
  // Columns of the built-in default appear only when a stored profile of this organisation has them.
  const used = new Set(list.flatMap(p => p.regions.map(r => r.key)))
  return [...seen.values()].filter(r => used.has(r.key))
}

/** Readiness of a dog for a date, from its stored pull work, computed by the coat model. */
export function readinessFor(profile: CoatProfile, work: CoatWork[] | undefined, date: ISODate): DogReadiness {
  return assessDog(profile, work ?? [], date)
}
