import { daysBetween, ruleSetEdition, type RuleSet } from '../../shared/coat'
import type { Role } from '../../shared/types/organisation'
import { isoWeekRange, renderWeeklyStatus, type WeeklyClassWarning, type WeeklyStatus, type WeeklyStatusMessage, type WeeklyTask } from '../../shared/weekly'
import type { TaskView } from '../../shared/types/tasks'
import type { Caller } from './auth'
import { callerRuleSet, loadEntryRecords } from './kennel'
import { loadDashboard } from './kennelDashboard'
import { classDefinition, entryView } from './kennelViews'
import { appUrl } from './mail'
import { entryScopeCondition, LIVE_STATUSES_SQL } from './scope'
import { loadTaskViews } from './tasks'
import { todayInTimeZone } from './time'
import { unsubscribeLinks } from './unsubscribe'

// The weekly status is put together from the same loaders as the dashboard, the task list and
// the entries, called as the recipient, so it holds exactly what that person may see through the
// API (server/utils/scope.ts) and the readiness the coat model computes for them.

/** The organisation fields a weekly status needs. */
export interface WeeklyOrganisation {
  id: number
  name: string
  timeZone: string
  ruleSet: RuleSet
  weeklyDay: number
  weeklyHour: number
  weeklyEnabled: boolean
  weeklyToAssistants: boolean
}

/** A member as a recipient of the weekly status. */
export interface WeeklyMember {
  userId: number
  name: string
  email: string
  role: Role
}

/** The member as the API's own scoping sees a caller. */
function recipientAsCaller(organisation: WeeklyOrganisation, member: WeeklyMember): Caller {
  return {
    userId: member.userId,
    name: member.name,
    email: member.email,
    organisationId: organisation.id,
    organisationName: organisation.name,
    timeZone: organisation.timeZone,
    ruleSet: organisation.ruleSet,
    role: member.role,
  }
}

function weeklyTask(t: TaskView): WeeklyTask {
  return {
    id: t.id,
    dueDate: t.dueDate,
    dogId: t.dog.id,
    dogCallName: t.dog.callName,
    kind: t.kind,
    regionLabels: t.regionLabels,
    assigneeName: t.assignee?.name ?? null,
    status: t.status,
    windowStart: t.windowStart,
    windowEnd: t.windowEnd,
    notes: t.notes,
  }
}

/**
 * Entries in coming shows (live, first day today or later) that the class rules question: not
 * eligible by age on the show's first day, entered after entries closed, or an unclear edge of
 * the rule (a dog exactly at a class's upper age, a birthday the month lacks). The rule set's
 * edition is named once in the message, not in every line.
 */
async function loadClassWarnings(caller: Caller, today: string): Promise<WeeklyClassWarning[]> {
  const ruleSet = callerRuleSet(caller)
  const records = await loadEntryRecords({
    sql: `${entryScopeCondition(caller, today, 'e')} AND e.status IN ${LIVE_STATUSES_SQL} AND s.first_day >= :weeklyToday`,
    replacements: { weeklyToday: today },
  })
  const warnings: WeeklyClassWarning[] = []
  for (const record of records) {
    const view = entryView(record, ruleSet)
    const base = { dogCallName: view.dog.callName, showName: view.show.name, showFirstDay: view.show.firstDay, classLabel: view.classLabel }
    // entryView ends its age warning with the rule set's edition; the message names it once, below the list.
    for (const warning of view.warnings) warnings.push({ ...base, message: warning.replace(` ${ruleSetEdition(ruleSet)}`, '') })
    // The class's own standing caveat (a title, a certificate) is not about this dog; an edge note is.
    const own = classDefinition(ruleSet, record.classCode)?.note ?? ''
    const edge = view.eligibility?.eligible ? (view.eligibility.note ?? '').replace(own, '').trim() : ''
    if (edge) warnings.push({ ...base, message: edge })
  }
  return warnings
}

/** What one member's weekly status holds for an ISO week, gathered now with the API's scoping for their role. */
export async function gatherWeeklyStatus(organisation: WeeklyOrganisation, member: WeeklyMember, week: string): Promise<WeeklyStatus> {
  const caller = recipientAsCaller(organisation, member)
  const today = todayInTimeZone(organisation.timeZone)
  const { start, end } = isoWeekRange(week)
  const from = today > start ? today : start
  const seesKennel = member.role !== 'assistant'
  const [dashboard, tasks, overdue, classWarnings] = await Promise.all([
    seesKennel ? loadDashboard(caller) : null,
    loadTaskViews(caller, { sql: `t.status <> 'skipped' AND t.due_date BETWEEN :weeklyFrom AND :weeklyTo`, replacements: { weeklyFrom: from, weeklyTo: end } }, today),
    loadTaskViews(caller, { sql: `t.status IN ('open', 'in-progress') AND t.due_date < :weeklyToday`, replacements: { weeklyToday: today } }, today),
    seesKennel ? loadClassWarnings(caller, today) : [],
  ])
  const links = unsubscribeLinks(member.userId, organisation.id)
  return {
    week,
    weekStart: start,
    weekEnd: end,
    today,
    organisation: { name: organisation.name, timeZone: organisation.timeZone, ruleSet: organisation.ruleSet },
    recipient: { name: member.name, role: member.role },
    dogs: (dashboard?.dogs ?? []).map(row => ({
      id: row.dog.id,
      callName: row.dog.callName,
      breed: row.dog.breed,
      handlerName: row.dog.handler?.name ?? null,
      nextShow: row.nextShow ? { name: row.nextShow.name, firstDay: row.nextShow.firstDay, inDays: daysBetween(today, row.nextShow.firstDay) } : null,
      score: row.score,
      onTrack: row.onTrack,
      weakest: row.weakest.map(w => ({ label: w.label, state: w.state, score: w.score })),
    })),
    // The dashboard plans the current week; a run for another week shows only the steps inside it.
    planSteps: (dashboard?.weekSteps ?? [])
      .filter(s => s.step.date >= start && s.step.date <= end)
      .map(s => ({ date: s.step.date, dogId: s.dog.id, dogCallName: s.dog.callName, kind: s.step.kind, regionLabels: s.regionLabels, note: s.step.note })),
    tasks: tasks.map(weeklyTask),
    overdue: overdue.map(weeklyTask),
    closingSoon: (dashboard?.closingSoon ?? []).map(c => ({
      showName: c.show.name,
      firstDay: c.show.firstDay,
      closes: c.show.entriesClose!,
      timeZone: c.show.timeZone,
      closesInDays: c.closesInDays,
      entryCount: c.show.entryCount,
    })),
    classWarnings,
    links: { app: appUrl('/'), ...links },
  }
}

/** One member's weekly status for an ISO week as the message they get: subject, both parts and the unsubscribe headers. */
export async function weeklyMessageFor(organisation: WeeklyOrganisation, member: WeeklyMember, week: string): Promise<WeeklyStatusMessage> {
  return renderWeeklyStatus(await gatherWeeklyStatus(organisation, member, week))
}
