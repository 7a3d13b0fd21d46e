import type { ISODate, RegionState, RuleSet, WorkKind } from '../coat'
import type { TaskStatus } from '../types/kennel'
import type { Role } from '../types/organisation'

/** One dog as the weekly status lists it: its next show, readiness for it and weakest regions. */
export interface WeeklyDog {
  id: number
  callName: string
  breed: string
  handlerName: string | null
  nextShow: { name: string, firstDay: ISODate, inDays: number } | null
  /** Readiness 0–100 for the next show; null without one. */
  score: number | null
  onTrack: boolean | null
  /** Up to three regions scoring below 100 for that show, weakest first. */
  weakest: { label: string, state: RegionState, score: number }[]
}

/** A step of a dog's work-back plan dated this week. */
export interface WeeklyPlanStep {
  date: ISODate
  dogId: number
  dogCallName: string
  kind: WorkKind
  regionLabels: string[]
  note: string
}

/** A grooming task, as the week's list and the overdue list show it. */
export interface WeeklyTask {
  id: number
  dueDate: ISODate
  dogId: number
  dogCallName: string
  kind: WorkKind
  regionLabels: string[]
  assigneeName: string | null
  status: TaskStatus
  windowStart: string | null
  windowEnd: string | null
  notes: string | null
}

/** A show whose entries close within the next 14 days. */
export interface WeeklyClosing {
  showName: string
  firstDay: ISODate
  /** Entries close, on the show's own wall clock. */
  closes: { date: ISODate, time: string }
  timeZone: string
  closesInDays: number
  /** Live entries of the recipient's dogs in it. */
  entryCount: number
}

/** Something about an entry in a coming show that the class rules question. */
export interface WeeklyClassWarning {
  dogCallName: string
  showName: string
  showFirstDay: ISODate
  classLabel: string
  message: string
}

/**
 * Everything one person's weekly status says, for one organisation and ISO week, already scoped
 * to what that person may see (DESIGN.md §2). renderWeeklyStatus turns it into the message.
 */
export interface WeeklyStatus {
  /** The ISO 8601 week, e.g. `2026-W49`. */
  week: string
  weekStart: ISODate
  weekEnd: ISODate
  /** The organisation's date when the status was put together. */
  today: ISODate
  organisation: { name: string, timeZone: string, ruleSet: RuleSet }
  recipient: { name: string, role: Role }
  /** Managers: every active dog; handlers: the active dogs they handle. By next show, soonest first (none last). Empty for assistants. */
  dogs: WeeklyDog[]
  planSteps: WeeklyPlanStep[]
  /** Tasks due from today to the week's Sunday, skipped ones left out. */
  tasks: WeeklyTask[]
  /** Open or in-progress tasks due before today. */
  overdue: WeeklyTask[]
  closingSoon: WeeklyClosing[]
  classWarnings: WeeklyClassWarning[]
  links: {
    /** The app's home page. */
    app: string
    /** The one-button page that confirms the unsubscribe. */
    unsubscribePage: string
    /** The RFC 8058 one-click address (POST `List-Unsubscribe=One-Click`). */
    oneClick: string
  }
}

/** A rendered weekly status: both parts and the headers that go with them. */
export interface WeeklyStatusMessage {
  subject: string
  html: string
  text: string
  headers: Record<string, string>
}
