import type { ISODate, PlanStep, WorkKind } from '../coat'
import type { PersonRef, TaskStatus } from './kennel'
import type { Role } from './organisation'

/** A region on a task with the area timer's limit from the dog's coat profile. */
export interface RegionLimit { key: string, label: string, minutes: number }

/** A grooming task as every task screen shows it. */
export interface TaskView {
  id: number
  dog: { id: number, callName: string, breed: string, markColour?: string | null }
  regions: string[]
  /** Labels of `regions` in the dog's profile, in the same order. */
  regionLabels: string[]
  /** Area-timer limit per region (the profile's timerMinutes, or DEFAULT_TIMER_MINUTES). */
  regionLimits: RegionLimit[]
  kind: WorkKind
  dueDate: ISODate
  /** Optional time window on the due date, 'HH:mm' in the organisation's time zone. */
  windowStart: string | null
  windowEnd: string | null
  assignee: PersonRef | null
  createdBy: PersonRef | null
  status: TaskStatus
  skipReason: string | null
  minutes: number | null
  notes: string | null
  /** The plan step the task came from (see planStepKey in shared/tasks.ts), or null. */
  planStepKey: string | null
  /** The coat work recorded when the task was finished; null until then or once removed. */
  coatWorkId: number | null
  /** When the task was finished, ISO 8601 in UTC. */
  doneAt: string | null
  /** Open or in progress with the due date before today (organisation's time zone). */
  overdue: boolean
  /** What the caller may do with this task. */
  can: { edit: boolean, assign: boolean, start: boolean, finish: boolean, skip: boolean, reopen: boolean, delete?: boolean }
  createdAt?: string
  updatedAt?: string
}

/** A person who can be given tasks on the week board, with the minutes planned each day. */
export interface BoardPerson {
  id: number
  name: string
  role: Role
  /** Minutes planned per day of `WeekBoardView.days`, keyed by ISO date (tasks' minutes, or the regions' timer limits when not yet known). */
  load: Record<ISODate, number>
  /** Sum of `load` over the week. */
  totalMinutes: number
}

/** GET /api/tasks/week?start=YYYY-MM-DD: the week board. */
export interface WeekBoardView {
  today: ISODate
  /** Seven ISO dates, Monday to Sunday. */
  days: ISODate[]
  people: BoardPerson[]
  /** Every task due in the week the caller may see, plus overdue open tasks from before it. */
  tasks: TaskView[]
}

/** A plan step as the task screens offer it: with its stable key and the task already made from it. */
export interface PlanStepOffer {
  key: string
  step: PlanStep
  regionLabels: string[]
  /** The task already made from this step, if any. */
  taskId: number | null
}

/** GET /api/tasks/plan-steps?dog=&from=&to=: the dog's plan steps, each saying whether it already has a task. */
export interface PlanStepsView {
  dogId: number
  today: ISODate
  from: ISODate
  to: ISODate
  steps: PlanStepOffer[]
  cautions: readonly string[]
}

/** POST /api/tasks/from-plan answer. */
export interface FromPlanResult {
  created: TaskView[]
  /** Steps that already had a task: that task, not duplicated. */
  existing: TaskView[]
}

/** GET /api/tasks/bath-window?dog=: the 48-hour window a bath done today opens for layer work. */
export interface BathWindowView {
  dogId: number
  /** Null when no bath task was done today. */
  window: {
    bathTask: TaskView
    /** The bath's done time, ISO 8601 in UTC. */
    from: string
    /** from + 48 hours, ISO 8601 in UTC. */
    until: string
    /** `until` as the organisation's wall clock. */
    untilLocal: { date: ISODate, time: string }
  } | null
  /** Layer plan steps dated inside the window. */
  steps: PlanStepOffer[]
  /** Open or in-progress layer tasks due inside the window. */
  tasks: TaskView[]
}
