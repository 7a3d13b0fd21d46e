import { addDays, isISODate, type ISODate } from '../../shared/coat'
import type { Role } from '../../shared/types/organisation'
import type { Caller } from './auth'

// Explicit imports only: the bench loads the grid's queries outside Nitro.

/** What the scoping rules need to know of a caller. */
export type ScopeCaller = Pick<Caller, 'userId' | 'organisationId' | 'role' | 'timeZone'>

/** Done or skipped tasks keep their dog in an assistant's reach for this many days after their due date (DESIGN.md §2). */
export const ASSISTANT_RECENT_TASK_DAYS = 14

/** Entry statuses that take a dog to the show, as an SQL list. */
export const LIVE_STATUSES_SQL = `('planned', 'entered', 'confirmed')`

// The conditions inline only server-side values (ids from the session, a checked date), so they
// can be pasted into model queries and raw SQL alike without replacements.
function int(value: number): string {
  if (!Number.isSafeInteger(value)) throw new Error(`Expected a whole number, got ${String(value)}`)
  return String(value)
}

function date(value: ISODate): string {
  if (!isISODate(value)) throw new Error(`Expected a date YYYY-MM-DD, got ${String(value)}`)
  return `DATE '${value}'`
}

/** Whether a role may see entries and shows at all (assistants see coat information only). */
export function seesEntries(role: Role): boolean {
  return role !== 'assistant'
}

/**
 * The SQL condition that keeps the rows of `dogs` (under `alias`) to those the caller may see:
 * a manager every dog of the organisation; a handler the dogs whose handler they are or that
 * have an entry naming them; an assistant the dogs on their open tasks, or on tasks done or
 * skipped with a due date in the last 14 days.
 */
export function dogScopeCondition(caller: ScopeCaller, today: ISODate, alias = 'd'): string {
  const org = `${alias}.organisation_id = ${int(caller.organisationId)}`
  const me = int(caller.userId)
  if (caller.role === 'manager') return org
  if (caller.role === 'handler') {
    return `${org} AND (${alias}.handler_id = ${me} OR EXISTS (SELECT 1 FROM entries scope_e WHERE scope_e.dog_id = ${alias}.id AND scope_e.handler_id = ${me}))`
  }
  const since = date(addDays(today, -ASSISTANT_RECENT_TASK_DAYS))
  return `${org} AND EXISTS (SELECT 1 FROM tasks scope_t WHERE scope_t.dog_id = ${alias}.id AND scope_t.assignee_id = ${me}`
    + ` AND (scope_t.status IN ('open', 'in-progress') OR (scope_t.status IN ('done', 'skipped') AND scope_t.due_date >= ${since})))`
}

/** A sub-select of the ids of the dogs the caller may see. */
export function visibleDogIdsSql(caller: ScopeCaller, today: ISODate): string {
  return `SELECT scope_d.id FROM dogs scope_d WHERE ${dogScopeCondition(caller, today, 'scope_d')}`
}

/**
 * The SQL condition that keeps the rows of `shows` (under `alias`) to those the caller may see:
 * a manager every show of the organisation; anyone else the shows with an entry of a dog they see.
 */
export function showScopeCondition(caller: ScopeCaller, today: ISODate, alias = 's'): string {
  const org = `${alias}.organisation_id = ${int(caller.organisationId)}`
  if (caller.role === 'manager') return org
  return `${org} AND EXISTS (SELECT 1 FROM entries scope_se WHERE scope_se.show_id = ${alias}.id AND scope_se.dog_id IN (${visibleDogIdsSql(caller, today)}))`
}

/** The SQL condition that keeps the rows of `entries` (under `alias`) to those of dogs the caller may see. */
export function entryScopeCondition(caller: ScopeCaller, today: ISODate, alias = 'e'): string {
  const org = `${alias}.organisation_id = ${int(caller.organisationId)}`
  if (caller.role === 'manager') return org
  return `${org} AND ${alias}.dog_id IN (${visibleDogIdsSql(caller, today)})`
}
