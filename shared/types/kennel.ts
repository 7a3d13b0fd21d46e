import type { ClassCheck, DogReadiness, ISODate, PlanStep, RegionProfile, RegionState, WorkBackPlan, WorkKind } from '../coat'

export const DOG_SEXES = ['dog', 'bitch'] as const
export type DogSex = typeof DOG_SEXES[number]
export const DOG_STATUSES = ['active', 'retired'] as const
export type DogStatus = typeof DOG_STATUSES[number]
export const ENTRY_STATUSES = ['planned', 'entered', 'confirmed', 'withdrawn'] as const
export type EntryStatus = typeof ENTRY_STATUSES[number]
export const TASK_STATUSES = ['open', 'in-progress', 'done', 'skipped'] as const
export type TaskStatus = typeof TASK_STATUSES[number]

/** Entry statuses that mean the dog is going to the show. */
export const LIVE_ENTRY_STATUSES: readonly EntryStatus[] = ['planned', 'entered', 'confirmed']

/** A region as a stored coat profile keeps it: the coat model's figures plus the area-timer limit. */
export interface StoredRegion extends RegionProfile {
  /** Minutes the area timer allows on this region before it warns (default 10). */
  timerMinutes?: number
}
export const DEFAULT_TIMER_MINUTES = 10

/** A member named on a record. */
export interface PersonRef { id: number, name: string }

/** A show named on a record. */
export interface ShowRef { id: number, name: string, firstDay: ISODate }

/** A region named in a view: its key and its label in the dog's profile. */
export interface RegionRef { key: string, label: string }

export interface ProfileView {
  id: number
  key: string
  label: string
  toleranceDays: number
  onTrackScore: number
  regions: StoredRegion[]
  isDefault: boolean
  dogCount: number
}

/** A dog as lists show it. */
export interface DogSummary {
  id: number
  callName: string
  registeredName: string
  registrationNumber: string | null
  breed: string
  sex: DogSex
  dateOfBirth: ISODate
  colour: string | null
  status: DogStatus
  handler: PersonRef | null
  coatProfileId: number
  /** The dog's next show with a live entry, on or after today in the organisation's time zone. */
  nextShow: ShowRef | null
  /** Readiness for `nextShow`; null when there is none. */
  readiness: { score: number, onTrack: boolean } | null
}

/** A dog with everything the caller may see of it. */
export interface DogView extends DogSummary {
  /** Null for assistants, who see coat information only. */
  owner: { name: string | null, email: string | null, phone: string | null } | null
  notes: string | null
  coatProfile: ProfileView
  /** What the caller may do with this dog. */
  can: { edit: boolean, delete: boolean, logWork: boolean, seeEntries: boolean }
}

export interface CoatWorkView {
  id: number
  dogId: number
  date: ISODate
  kind: WorkKind
  regions: string[]
  workedBy: PersonRef | null
  recordedBy: PersonRef | null
  minutes: number | null
  notes: string | null
  taskId: number | null
  createdAt: string
  updatedAt: string
  /** The author and managers may edit and delete. */
  canEdit: boolean
}

export interface ShowView {
  id: number
  name: string
  club: string | null
  firstDay: ISODate
  lastDay: ISODate
  place: string | null
  judges: string[]
  timeZone: string
  /** The moment entries close, ISO 8601 in UTC, or null when not known. */
  entriesCloseAt: string | null
  /** The same moment as the show's own wall clock: date and HH:mm in `timeZone`. */
  entriesClose: { date: ISODate, time: string } | null
  notes: string | null
  /** Live entries the caller may see. */
  entryCount: number
}

export interface EntryView {
  id: number
  dog: { id: number, callName: string, registeredName: string, dateOfBirth: ISODate }
  show: ShowRef
  classCode: string
  classLabel: string
  armband: string | null
  status: EntryStatus
  handler: PersonRef | null
  notes: string | null
  /** The class's age check for this dog on the show's first day, under the organisation's rule set. */
  eligibility: ClassCheck | null
  /** Plain sentences: not eligible by age, entered after entries closed, unknown class, … */
  warnings: string[]
}

export interface ReadinessView {
  dogId: number
  show: ShowRef | null
  showDate: ISODate
  readiness: DogReadiness
  regions: RegionRef[]
}

export interface PlanView {
  dogId: number
  today: ISODate
  shows: ShowRef[]
  plan: WorkBackPlan
  regions: RegionRef[]
  cautions: readonly string[]
}

export interface GridCell {
  state: RegionState
  score: number
  bloomStart: ISODate | null
  bloomEnd: ISODate | null
  /** Days from the show date until bloom starts (bare, coming-in). */
  daysToBloom: number | null
  /** Days from bloom's end to the show date (past-peak). */
  daysPastPeak: number | null
}

export interface GridRow {
  dog: { id: number, callName: string, registeredName: string, breed: string, handler: PersonRef | null }
  show: ShowRef | null
  score: number | null
  onTrack: boolean | null
  /** Keyed by region; null where the dog's profile has no such region. */
  cells: Record<string, GridCell | null>
}

export interface GridView {
  /** 'show': every row for one show; 'next': each dog for its own next show. */
  mode: 'show' | 'next'
  show: ShowRef | null
  today: ISODate
  regions: RegionRef[]
  rows: GridRow[]
}

export interface DashboardView {
  today: ISODate
  dogs: {
    dog: { id: number, callName: string, breed: string, handler: PersonRef | null }
    nextShow: ShowRef | null
    score: number | null
    onTrack: boolean | null
    weakest: { region: string, label: string, state: RegionState, score: number }[]
  }[]
  weekSteps: { dog: { id: number, callName: string }, step: PlanStep, regionLabels: string[] }[]
  closingSoon: { show: ShowView, closesInDays: number }[]
  noRecord: { id: number, callName: string }[]
  /** Mean readiness of the active dogs if shown on each coming Monday, and the share on track. */
  trend: { dates: ISODate[], averageScore: number[], onTrackShare: number[] }
}

/** A page of a list. */
export interface Page<T> { items: T[], total: number }

/** How each work kind reads in the interface: a short name and what it is (DESIGN.md §3). */
export const WORK_KIND_LABELS: Record<WorkKind, { word: string, hint: string }> = {
  strip: { word: 'Strip', hint: 'Taken to the skin' },
  layer: { word: 'Layer', hint: 'A serious layer pulled: this grows into the show coat' },
  roll: { word: 'Roll', hint: 'A light pass on the longest hairs' },
  card: { word: 'Card', hint: 'Undercoat carded or raked out' },
  bath: { word: 'Bath', hint: 'Stands the coat up for work within a day or two' },
  trim: { word: 'Trim', hint: 'Scissoring of furnishings' },
}

/** A piece of coat work in the log; `deletedAt` is set only on deleted work, which managers list with `?deleted=true`. */
export interface CoatWorkLogItem extends CoatWorkView {
  deletedAt: string | null
  deletedBy: PersonRef | null
}

/** One recorded change (create, update, delete) with the record before and after it. */
export interface AuditEventView {
  id: number
  entity: string
  entityId: number
  action: 'create' | 'update' | 'delete' | 'restore'
  actor: PersonRef | null
  at: string
  before: Record<string, unknown> | null
  after: Record<string, unknown> | null
  /** The names of the people `before` and `after` name by id (AUDIT_PERSON_FIELDS), by user id. */
  people: Record<string, string>
}

/** The fields of an audited row that name a person by user id. */
export const AUDIT_PERSON_FIELDS = ['workedById', 'recordedById', 'deletedById', 'assigneeId', 'createdById', 'handlerId'] as const
