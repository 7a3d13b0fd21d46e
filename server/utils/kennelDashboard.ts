import { addDays, daysBetween, DEFAULT_PROFILE, planWorkBack, type CoatProfile, type CoatWork } from '../../shared/coat'
import type { DashboardView } from '../../shared/types/kennel'
import type { Caller } from './auth'
import { kennelSequelize, loadShowRecords } from './kennel'
import { loadDogRecords, loadLiveShows, loadProfiles, loadPullWork, readinessFor, type SqlWhere } from './kennelData'
import { showView, type ShowRecord } from './kennelViews'
import { dogScopeCondition, seesEntries, showScopeCondition } from './scope'
import { comingMondays, isoWeekMonday, todayInTimeZone } from './time'

/** Entries closing within this many days are listed on the dashboard. */
export const CLOSING_SOON_DAYS = 14
/** The readiness trend covers this many coming Mondays. */
export const TREND_WEEKS = 12
const WEAKEST_REGIONS = 3

const round = (value: number, places: number) => Math.round(value * 10 ** places) / 10 ** places
const labelOf = (profile: CoatProfile, key: string) => profile.regions.find(r => r.key === key)?.label ?? key

/**
 * The dashboard of the dogs the caller may see (active only), computed on request from the stored
 * work: each dog's next show and readiness with its weakest regions, this ISO week's plan steps,
 * shows whose entries close within 14 days (none for assistants), dogs with no strip or layer on
 * record, and the kennel's mean readiness and share on track if shown on each of the next 12 Mondays.
 */
export async function loadDashboard(caller: Caller): Promise<DashboardView> {
  const sequelize = kennelSequelize()
  const today = todayInTimeZone(caller.timeZone)
  const dogWhere: SqlWhere = { sql: `d.status = 'active' AND ${dogScopeCondition(caller, today, 'd')}` }
  const dogIds: SqlWhere = { sql: `SELECT d.id FROM dogs d WHERE ${dogWhere.sql}` }
  const [dogs, work, shows, profiles, closing] = await Promise.all([
    loadDogRecords(sequelize, dogWhere),
    loadPullWork(sequelize, dogIds),
    loadLiveShows(sequelize, dogIds, today),
    loadProfiles(sequelize, caller.organisationId),
    seesEntries(caller.role)
      ? loadShowRecords(caller, today, {
          sql: `${showScopeCondition(caller, today, 's')} AND s.entries_close_at > now() AND s.entries_close_at <= now() + make_interval(days => ${CLOSING_SOON_DAYS})`,
        }, 's.entries_close_at, s.id')
      : Promise.resolve([] as (ShowRecord & { entryCount: string })[]),
  ])

  const monday = isoWeekMonday(today)
  const sunday = addDays(monday, 6)
  const trendDates = comingMondays(today, TREND_WEEKS)
  const trendScores = trendDates.map(() => 0)
  const trendOnTrack = trendDates.map(() => 0)
  const rows: DashboardView['dogs'] = []
  const weekSteps: DashboardView['weekSteps'] = []
  const noRecord: DashboardView['noRecord'] = []

  for (const dog of dogs) {
    const profile = profiles.get(dog.coatProfileId) ?? DEFAULT_PROFILE
    const pulls: CoatWork[] = work.get(dog.id) ?? []
    const upcoming = shows.get(dog.id) ?? []
    const next = upcoming[0] ?? null
    if (!pulls.length) noRecord.push({ id: dog.id, callName: dog.callName })

    const readiness = next ? readinessFor(profile, pulls, next.firstDay) : null
    const weights = new Map(profile.regions.map((r, i) => [r.key, { weight: r.weight, order: i }]))
    const weakest = (readiness?.regions ?? [])
      .filter(r => r.score < 100)
      .sort((a, b) => a.score - b.score || weights.get(b.region)!.weight - weights.get(a.region)!.weight || weights.get(a.region)!.order - weights.get(b.region)!.order)
      .slice(0, WEAKEST_REGIONS)
      .map(r => ({ region: r.region, label: labelOf(profile, r.region), state: r.state, score: r.score }))
    rows.push({
      dog: { id: dog.id, callName: dog.callName, breed: dog.breed, handler: dog.handlerId === null ? null : { id: dog.handlerId, name: dog.handlerName ?? '' } },
      nextShow: next,
      score: readiness?.score ?? null,
      onTrack: readiness?.onTrack ?? null,
      weakest,
    })

    if (upcoming.length) {
      // The plan starts from work already done; a pull dated after today (a clock change) waits for its day.
      const done = pulls.filter(w => w.date <= today)
      const plan = planWorkBack(profile, done, upcoming.map(s => s.firstDay), today)
      for (const step of plan.steps) {
        if (step.date >= monday && step.date <= sunday) {
          weekSteps.push({ dog: { id: dog.id, callName: dog.callName }, step, regionLabels: step.regions.map(k => labelOf(profile, k)) })
        }
      }
    }

    trendDates.forEach((date, i) => {
      const r = readinessFor(profile, pulls, date)
      trendScores[i]! += r.score
      if (r.onTrack) trendOnTrack[i]! += 1
    })
  }

  const noShow = '9999-12-31'
  rows.sort((a, b) => {
    const da = a.nextShow?.firstDay ?? noShow
    const db = b.nextShow?.firstDay ?? noShow
    return da < db ? -1 : da > db ? 1 : (a.score ?? 101) - (b.score ?? 101)
  })
  weekSteps.sort((a, b) => (a.step.date < b.step.date ? -1 : a.step.date > b.step.date ? 1 : 0))

  return {
    today,
    dogs: rows,
    weekSteps,
    closingSoon: closing.map((s) => {
      const view = showView(s, Number(s.entryCount))
      return { show: view, closesInDays: daysBetween(todayInTimeZone(s.timeZone), view.entriesClose!.date) }
    }),
    noRecord,
    trend: {
      dates: trendDates,
      averageScore: trendScores.map(sum => (dogs.length ? round(sum / dogs.length, 1) : 0)),
      onTrackShare: trendOnTrack.map(n => (dogs.length ? round(n / dogs.length, 3) : 0)),
    },
  }
}

