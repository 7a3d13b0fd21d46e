import type { OutboxStatus } from '../../shared/types/mail'
import type { Role } from '../../shared/types/organisation'
import type { WeeklyRecipientState, WeeklyRecipientView, WeeklySendOutcome, WeeklySettingsView, WeeklySubscriptionView } from '../../shared/types/weekly'
import { isoWeekRange, nextWeeklySendAt, weeklyDue, weeklySendAt, type WeeklySchedule, type ZoneClock } from '../../shared/weekly'
import type { Organisation } from '../database/models'
import type { Caller } from './auth'
import { kennelSequelize } from './kennel'
import { selectRows } from './kennelData'
import { queueMail } from './mail'
import { todayInTimeZone, wallClockToInstant } from './time'
import { weeklyUnsubscribedAt } from './unsubscribe'
import { weeklyMessageFor, type WeeklyMember, type WeeklyOrganisation } from './weeklyStatus'

/** The pg-boss queue of the weekly tick; its cron runs it every minute. */
export const WEEKLY_TICK_QUEUE = 'weekly-status-tick'

/** The zone clock of server/utils/time.ts, which decides how a skipped or doubled hour reads. */
export const weeklyClock: ZoneClock = {
  dateAt: (instant, timeZone) => todayInTimeZone(timeZone, instant),
  instantOf: wallClockToInstant,
}

/** An organisation row's weekly settings as the schedule reads them. */
export function weeklySchedule(organisation: Pick<WeeklyOrganisation, 'weeklyDay' | 'weeklyHour' | 'timeZone' | 'weeklyEnabled'>): WeeklySchedule {
  return { day: organisation.weeklyDay, hour: organisation.weeklyHour, timeZone: organisation.timeZone, enabled: organisation.weeklyEnabled }
}

/** An organisation model row as the weekly status reads it. */
export function weeklyOrganisation(row: Organisation): WeeklyOrganisation {
  return {
    id: row.id,
    name: row.name,
    timeZone: row.timeZone,
    ruleSet: row.ruleSet,
    weeklyDay: row.weeklyDay,
    weeklyHour: row.weeklyHour,
    weeklyEnabled: row.weeklyEnabled,
    weeklyToAssistants: row.weeklyToAssistants,
  }
}

/** Whether a role gets the weekly status: managers and handlers always, assistants when the organisation says so. */
export function roleReceives(organisation: Pick<WeeklyOrganisation, 'weeklyToAssistants'>, role: Role): boolean {
  return role !== 'assistant' || organisation.weeklyToAssistants
}

interface MemberRow extends WeeklyMember {
  unsubscribedAt: Date | null
  outboxId: string | null
  outboxStatus: OutboxStatus | null
  outboxSubject: string | null
  outboxQueuedAt: Date | null
  outboxSentAt: Date | null
  outboxAttempts: number | null
  outboxLastError: string | null
}

const ROLE_ORDER_SQL = `CASE m.role WHEN 'manager' THEN 0 WHEN 'handler' THEN 1 ELSE 2 END`

/**
 * Every member of the organisation with whether they get an ISO week's status and where theirs
 * stands: their unsubscribe, and the week's outbox row (matched by user or, for a row whose user
 * has gone, by address). Managers first, then handlers, then assistants, each by name.
 */
export async function loadWeeklyRecipients(organisation: WeeklyOrganisation, week: string): Promise<WeeklyRecipientView[]> {
  const rows = await selectRows<MemberRow>(kennelSequelize(),
    `SELECT m.user_id AS "userId", u.name, u.email, m.role,
       mu.created_at AS "unsubscribedAt",
       o.id AS "outboxId", o.status AS "outboxStatus", o.subject AS "outboxSubject", o.created_at AS "outboxQueuedAt",
       o.sent_at AS "outboxSentAt", o.attempts AS "outboxAttempts", o.last_error AS "outboxLastError"
     FROM memberships m JOIN users u ON u.id = m.user_id
     LEFT JOIN mail_unsubscribes mu ON mu.user_id = m.user_id AND mu.organisation_id = m.organisation_id AND mu.kind = 'weekly_status'
     LEFT JOIN LATERAL (
       SELECT * FROM mail_outbox ob
       WHERE ob.organisation_id = m.organisation_id AND ob.kind = 'weekly_status' AND ob.period_key = :week
         AND (ob.recipient_user_id = m.user_id OR lower(ob.recipient_email) = lower(u.email))
       ORDER BY ob.id LIMIT 1
     ) o ON true
     WHERE m.organisation_id = :organisationId
     ORDER BY ${ROLE_ORDER_SQL}, lower(u.name), m.user_id`,
    { organisationId: organisation.id, week })
  return rows.map((r) => {
    const unsubscribed = r.unsubscribedAt !== null
    const byRole = roleReceives(organisation, r.role)
    const state: WeeklyRecipientState = r.outboxStatus ?? (unsubscribed ? 'unsubscribed' : byRole ? 'not-yet' : 'not-a-recipient')
    return {
      userId: r.userId,
      name: r.name,
      email: r.email,
      role: r.role,
      receives: byRole && !unsubscribed,
      unsubscribed,
      unsubscribedAt: r.unsubscribedAt ? new Date(r.unsubscribedAt).toISOString() : null,
      state,
      delivery: r.outboxId === null
        ? null
        : {
            id: Number(r.outboxId),
            status: r.outboxStatus!,
            subject: r.outboxSubject!,
            queuedAt: new Date(r.outboxQueuedAt!).toISOString(),
            sentAt: r.outboxSentAt ? new Date(r.outboxSentAt).toISOString() : null,
            attempts: r.outboxAttempts ?? 0,
            lastError: r.outboxLastError,
          },
    }
  })
}

/**
 * Queues an ISO week's status for every member who gets it (or only `userId`) and has none in the
 * outbox for that week. The outbox key (organisation, address, kind, week) is what keeps it to one
 * message: a second run, a retried job or another instance that gets here at the same moment writes
 * nothing and is told the message is already there.
 */
export async function queueWeeklyStatus(organisation: WeeklyOrganisation, week: string, options: { userId?: number } = {}): Promise<WeeklySendOutcome[]> {
  const members = (await loadWeeklyRecipients(organisation, week)).filter(m => options.userId === undefined || m.userId === options.userId)
  const outcomes: WeeklySendOutcome[] = []
  const failures: string[] = []
  for (const member of members) {
    const base = { userId: member.userId, name: member.name, email: member.email }
    if (member.delivery) {
      outcomes.push({ ...base, outcome: 'already-sent', status: member.delivery.status })
      continue
    }
    if (member.unsubscribed) {
      outcomes.push({ ...base, outcome: 'unsubscribed', status: null })
      continue
    }
    if (!member.receives) {
      outcomes.push({ ...base, outcome: 'not-a-recipient', status: null })
      continue
    }
    try {
      const message = await weeklyMessageFor(organisation, member, week)
      const { queued } = await queueMail({
        organisationId: organisation.id,
        recipientUserId: member.userId,
        to: member.email,
        toName: member.name,
        kind: 'weekly_status',
        periodKey: week,
        message,
      })
      outcomes.push({ ...base, outcome: queued ? 'queued' : 'already-sent', status: queued ? 'pending' : null })
    }
    catch (error) {
      // One person's message failing to build must not hold up everyone after them.
      failures.push(`${member.email}: ${(error as Error).message}`)
    }
  }
  if (failures.length) throw new Error(`The weekly status could not be built for ${failures.join('; ')}`)
  return outcomes
}

/**
 * The weekly tick (pg-boss runs it every minute, once across all instances): for every organisation
 * with the weekly status on whose send time for its current ISO week has passed on its own clock,
 * queues that week's status for whoever has none yet. `at` evaluates the schedule at another
 * instant (tests, or an operator re-running a week); the status itself is always gathered now.
 */
export async function runWeeklyTick(options: { at?: Date, organisationId?: number } = {}) {
  const at = options.at ?? new Date()
  const { Organisation } = useModels()
  const organisations = await Organisation.findAll({
    where: { weeklyEnabled: true, ...(options.organisationId ? { id: options.organisationId } : {}) },
    order: [['id', 'ASC']],
  })
  let queued = 0
  let due = 0
  const failures: string[] = []
  for (const row of organisations) {
    const organisation = weeklyOrganisation(row)
    const state = weeklyDue(at, weeklySchedule(organisation), weeklyClock)
    if (!state.due) continue
    due += 1
    try {
      const outcomes = await queueWeeklyStatus(organisation, state.week)
      queued += outcomes.filter(o => o.outcome === 'queued').length
    }
    catch (error) {
      // One organisation's failure must not hold up the others; thrown at the end, so pg-boss
      // tries the tick again, and the outbox key keeps what was queued from going twice.
      failures.push(`organisation ${organisation.id}: ${(error as Error).message}`)
    }
  }
  if (failures.length) throw new Error(`The weekly status could not be queued for ${failures.join('; ')}`)
  return { organisations: organisations.length, due, queued }
}

/** The caller's organisation as the weekly status reads it. */
export async function callerWeeklyOrganisation(caller: Pick<Caller, 'organisationId'>): Promise<WeeklyOrganisation> {
  const row = await useModels().Organisation.findByPk(caller.organisationId)
  if (!row) throw notFound('organisation')
  return weeklyOrganisation(row)
}

/** The settings as the weekly page shows them, with where the current week stands. */
export function weeklySettingsView(organisation: WeeklyOrganisation, now = new Date()): WeeklySettingsView {
  const schedule = weeklySchedule(organisation)
  const state = weeklyDue(now, schedule, weeklyClock)
  return {
    day: organisation.weeklyDay,
    hour: organisation.weeklyHour,
    enabled: organisation.weeklyEnabled,
    toAssistants: organisation.weeklyToAssistants,
    timeZone: organisation.timeZone,
    week: state.week,
    sendAt: state.sendAt.toISOString(),
    due: now >= state.sendAt,
    nextSendAt: organisation.weeklyEnabled ? nextWeeklySendAt(now, schedule, weeklyClock).toISOString() : null,
  }
}

/** The week a member list is for: the one asked for, else the organisation's current ISO week. */
export function weeklyWeekOf(organisation: WeeklyOrganisation, week?: string, now = new Date()) {
  const current = weeklyDue(now, weeklySchedule(organisation), weeklyClock)
  const chosen = week ?? current.week
  const sendAt = chosen === current.week ? current.sendAt : weeklySendAt(chosen, weeklySchedule(organisation), weeklyClock)
  return { week: chosen, ...isoWeekRange(chosen), sendAt, due: now >= sendAt }
}

/** The caller's own weekly status: whether they get it, since when they do not, and when it goes out. */
export async function weeklySubscriptionView(caller: Pick<Caller, 'userId' | 'organisationId' | 'role'>, now = new Date()): Promise<WeeklySubscriptionView> {
  const organisation = await callerWeeklyOrganisation(caller)
  const since = await weeklyUnsubscribedAt(caller.userId, caller.organisationId)
  const settings = weeklySettingsView(organisation, now)
  return {
    subscribed: since === null,
    unsubscribedAt: since?.toISOString() ?? null,
    sentToRole: organisation.weeklyEnabled && roleReceives(organisation, caller.role),
    day: settings.day,
    hour: settings.hour,
    timeZone: settings.timeZone,
    nextSendAt: settings.nextSendAt,
  }
}
