import { createHash, randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import ical, { type ICalCalendar } from 'ical-generator'
import { addDays, COAT_CAUTIONS, planWorkBack, type ISODate, type PlanStep } from '../../shared/coat'
import type { Caller } from './auth'
import { callerToday, kennelSequelize } from './kennel'
import { loadDogRecords, loadLiveShows, loadProfiles, loadPullWork, selectRows, type DogRecord, type StoredProfile } from './kennelData'
import { dogScopeCondition, seesEntries, showScopeCondition } from './scope'
import { loadTaskRecords } from './tasks'

/** How far back a feed reaches: shows and tasks older than this drop out of people's calendars. */
export const FEED_PAST_DAYS = 90

/** A new secret feed token (32 random bytes, base64url) and the sha-256 hex that is all the database keeps. */
export function newFeedToken(): { token: string, hash: string } {
  const token = randomBytes(32).toString('base64url')
  return { token, hash: hashFeedToken(token) }
}

/** The sha-256 hex of a feed token. */
export function hashFeedToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}

/** The app's public origin: AUTH_ORIGIN less its /api/auth, or the request's own origin. */
export function appOrigin(event: H3Event): string {
  const configured = process.env.AUTH_ORIGIN?.replace(/\/api\/auth\/?$/, '').replace(/\/$/, '')
  return configured || getRequestURL(event).origin
}

/** An empty Bloomline calendar; ical-generator writes PRODID and VERSION and folds lines at 75 octets. */
export function newCalendar(name: string): ICalCalendar {
  return ical({ name, prodId: { company: 'Bloomline', product: 'Calendar', language: 'EN' } })
}

// An all-day event's date as ical-generator reads it: midnight UTC prints as that DATE value.
const utcDay = (date: ISODate) => new Date(`${date}T00:00:00Z`)

function allDay(cal: ICalCalendar, id: string, date: ISODate, lastDay: ISODate, summary: string, description?: string, location?: string | null) {
  // RFC 5545 §3.6.1: an all-day DTEND is exclusive, the day after the last day.
  cal.createEvent({ id, start: utcDay(date), end: utcDay(addDays(lastDay, 1)), allDay: true, summary, description, location: location ?? undefined })
}

const cautionsText = () => `Cautions:\n${COAT_CAUTIONS.map(c => `- ${c}`).join('\n')}`

/** The UID of a plan step: stable while the plan proposes the same work on the same day. */
export function planStepUid(dogId: number, step: Pick<PlanStep, 'date' | 'kind' | 'regions'>): string {
  return `plan-${dogId}-${step.date}-${step.kind}-${[...step.regions].sort().join('+')}@bloomline`
}

/** Adds a dog's plan steps as all-day events, each with its note and the coat cautions. */
export function addPlanEvents(cal: ICalCalendar, dog: Pick<DogRecord, 'id' | 'callName'>, steps: readonly PlanStep[], profile: StoredProfile | undefined) {
  const labels = new Map((profile?.regions ?? []).map(r => [r.key, r.label]))
  for (const step of steps) {
    const regions = step.regions.map(r => labels.get(r) ?? r).join(', ')
    allDay(cal, planStepUid(dog.id, step), step.date, step.date, `${dog.callName}: ${step.kind} (${regions})`, `${step.note}\n\n${cautionsText()}`)
  }
}

/** The plan steps, from today, of the dogs the caller may see, for their live shows. */
async function addPlansOf(cal: ICalCalendar, caller: Caller, today: ISODate) {
  const sequelize = kennelSequelize()
  const scope = dogScopeCondition(caller, today, 'd')
  const ids = { sql: `SELECT d.id FROM dogs d WHERE ${scope}`, replacements: {} }
  const [dogs, work, shows, profiles] = await Promise.all([
    loadDogRecords(sequelize, { sql: scope, replacements: {} }),
    loadPullWork(sequelize, ids),
    loadLiveShows(sequelize, ids, today),
    loadProfiles(sequelize, caller.organisationId),
  ])
  for (const dog of dogs) {
    const dogShows = shows.get(dog.id)
    const profile = profiles.get(dog.coatProfileId)
    if (!dogShows?.length || !profile) continue
    const done = (work.get(dog.id) ?? []).filter(w => w.date <= today)
    addPlanEvents(cal, dog, planWorkBack(profile, done, dogShows.map(s => s.firstDay), today).steps, profile)
  }
}

/**
 * A person's whole feed, scoped exactly as the API scopes them: shows, entries closing and plan
 * steps for managers and handlers (their dogs), and the tasks they may see; an assistant gets
 * only their own tasks.
 */
export async function buildFeed(caller: Caller): Promise<ICalCalendar> {
  const today = callerToday(caller)
  const since = addDays(today, -FEED_PAST_DAYS)
  const cal = newCalendar(`Bloomline — ${caller.organisationName}`)
  if (seesEntries(caller.role)) {
    const shows = await selectRows<{ id: number, name: string, firstDay: ISODate, lastDay: ISODate, place: string | null, entriesCloseAt: Date | null }>(kennelSequelize(),
      `SELECT s.id, s.name, s.first_day AS "firstDay", s.last_day AS "lastDay", s.place, s.entries_close_at AS "entriesCloseAt"
       FROM shows s WHERE ${showScopeCondition(caller, today, 's')} AND s.last_day >= :since ORDER BY s.first_day, s.id`, { since })
    for (const show of shows) {
      allDay(cal, `show-${show.id}@bloomline`, show.firstDay, show.lastDay, show.name, undefined, show.place)
      if (show.entriesCloseAt) {
        // A moment, not a day: the UTC instant the entries close, whatever the reader's time zone.
        const at = new Date(show.entriesCloseAt)
        cal.createEvent({ id: `close-${show.id}@bloomline`, start: at, end: at, summary: `Entries close: ${show.name}` })
      }
    }
    await addPlansOf(cal, caller, today)
  }
  const tasks = await loadTaskRecords(caller, { sql: 't.due_date >= :feedSince', replacements: { feedSince: since } }, { today })
  for (const task of tasks) {
    const description = [task.notes, task.windowStart ? `Window: ${task.windowStart}–${task.windowEnd ?? ''}` : null, cautionsText()].filter(Boolean).join('\n\n')
    allDay(cal, `task-${task.id}@bloomline`, task.dueDate, task.dueDate, `${task.dogCallName}: ${task.kind} (${task.status})`, description)
  }
  return cal
}

/** Sends a calendar as text/calendar, kept out of shared caches. */
export function sendCalendar(event: H3Event, cal: ICalCalendar, attachmentName?: string): string {
  setResponseHeader(event, 'Content-Type', 'text/calendar; charset=utf-8')
  setResponseHeader(event, 'Cache-Control', 'private, max-age=0')
  if (attachmentName) setResponseHeader(event, 'Content-Disposition', `attachment; filename="${attachmentName}"`)
  return cal.toString()
}
