import type { Sequelize } from 'sequelize'
import { daysBetween, DEFAULT_PROFILE, type CoatWork, type ISODate, type RegionReadiness } from '../../shared/coat'
import type { GridCell, GridRow, GridView, ShowRef } from '../../shared/types/kennel'
import { getSequelize } from '../database/connection'
import { loadDogRecords, loadLiveShows, loadProfiles, loadPullWork, readinessFor, selectRows, unionRegions, type DogRecord, type SqlWhere, type StoredProfile } from './kennelData'
import { dogScopeCondition, LIVE_STATUSES_SQL, showScopeCondition, visibleDogIdsSql, type ScopeCaller } from './scope'
import { todayInTimeZone } from './time'

// Explicit imports only: `npm run bench` calls loadGridRows outside Nitro to time the grid's
// own queries beside GET /api/grid.

/** What the coat grid is computed from: the rows its few raw queries fetch. */
export interface GridRows {
  mode: GridView['mode']
  today: ISODate
  /** The one show every row is assessed for ('show' mode), else null. */
  show: ShowRef | null
  /** Active dogs the caller may see, by call name. */
  dogs: DogRecord[]
  /** Each dog's strip and layer work, not deleted. */
  work: Map<number, CoatWork[]>
  /** 'next' mode: each dog's next show with a live entry. */
  nextShows: Map<number, ShowRef[]>
  /** 'show' mode: the dogs with a live entry in the show. */
  entered: Set<number>
  profiles: Map<number, StoredProfile>
}

/**
 * Fetches the coat grid's rows for a caller with four raw queries run side by side (dogs, their
 * pull work, their next shows or the show's entries, the profiles), after one look-up of the show
 * in 'show' mode. `show` is a show id, or 'next'/undefined for each dog's own next show. Null when
 * the show is not one the caller may see.
 */
export async function loadGridRows(caller: ScopeCaller, show: number | 'next' | undefined, sequelize: Sequelize = getSequelize()): Promise<GridRows | null> {
  const today = todayInTimeZone(caller.timeZone)
  const dogWhere: SqlWhere = { sql: `d.status = 'active' AND ${dogScopeCondition(caller, today, 'd')}` }
  const dogIds: SqlWhere = { sql: `SELECT d.id FROM dogs d WHERE ${dogWhere.sql}` }
  let chosen: ShowRef | null = null
  if (typeof show === 'number') {
    const found = await selectRows<ShowRef>(sequelize,
      `SELECT s.id, s.name, s.first_day AS "firstDay" FROM shows s WHERE s.id = :show AND ${showScopeCondition(caller, today, 's')}`, { show })
    chosen = found[0] ?? null
    if (!chosen) return null
  }
  const [dogs, work, nextShows, entered, profiles] = await Promise.all([
    loadDogRecords(sequelize, dogWhere),
    loadPullWork(sequelize, dogIds),
    chosen ? new Map<number, ShowRef[]>() : loadLiveShows(sequelize, dogIds, today, true),
    chosen
      ? selectRows<{ dogId: number }>(sequelize,
          `SELECT DISTINCT e.dog_id AS "dogId" FROM entries e WHERE e.show_id = :show AND e.status IN ${LIVE_STATUSES_SQL}
           AND e.dog_id IN (${visibleDogIdsSql(caller, today)})`, { show: chosen.id }).then(rows => new Set(rows.map(r => r.dogId)))
      : new Set<number>(),
    loadProfiles(sequelize, caller.organisationId),
  ])
  return { mode: chosen ? 'show' : 'next', today, show: chosen, dogs, work, nextShows, entered, profiles }
}

function gridCell(region: RegionReadiness, showDate: ISODate): GridCell {
  const waiting = region.state === 'bare' || region.state === 'coming-in'
  return {
    state: region.state,
    score: region.score,
    bloomStart: region.bloomStart,
    bloomEnd: region.bloomEnd,
    daysToBloom: waiting && region.bloomStart ? daysBetween(showDate, region.bloomStart) : null,
    daysPastPeak: region.state === 'past-peak' && region.bloomEnd ? daysBetween(region.bloomEnd, showDate) : null,
  }
}

/**
 * The coat grid from its rows, computed by the coat model. 'show' mode: every dog assessed for
 * the show's first day, dogs entered in it first (their `show` set, the others' null). 'next'
 * mode: each dog for its own next show, soonest first; a dog with no next show is assessed for
 * today, with no score. Columns are the union of the dogs' regions in the default profile's order.
 */
export function buildGridView(rows: GridRows): GridView {
  const regions = unionRegions(rows.profiles.values())
  const built: GridRow[] = rows.dogs.map((dog) => {
    const profile = rows.profiles.get(dog.coatProfileId) ?? DEFAULT_PROFILE
    const show = rows.show ? (rows.entered.has(dog.id) ? rows.show : null) : rows.nextShows.get(dog.id)?.[0] ?? null
    const date = rows.show?.firstDay ?? show?.firstDay ?? rows.today
    const readiness = readinessFor(profile, rows.work.get(dog.id), date)
    const cells: Record<string, GridCell | null> = {}
    for (const r of regions) cells[r.key] = null
    for (const r of readiness.regions) cells[r.region] = gridCell(r, date)
    const scored = rows.show !== null || show !== null
    return {
      dog: {
        id: dog.id,
        callName: dog.callName,
        registeredName: dog.registeredName,
        breed: dog.breed,
        handler: dog.handlerId === null ? null : { id: dog.handlerId, name: dog.handlerName ?? '' },
      },
      show,
      score: scored ? readiness.score : null,
      onTrack: scored ? readiness.onTrack : null,
      cells,
    }
  })
  if (rows.mode === 'next') {
    // Stable sort: dogs keep their call-name order within a show date; no show comes last.
    const date = (row: GridRow) => row.show?.firstDay ?? '9999-12-31'
    built.sort((a, b) => (date(a) < date(b) ? -1 : date(a) > date(b) ? 1 : 0))
  }
  else {
    built.sort((a, b) => Number(b.show !== null) - Number(a.show !== null))
  }
  return { mode: rows.mode, show: rows.show, today: rows.today, regions, rows: built }
}
