/** A calendar date written 'YYYY-MM-DD', with no time of day and no time zone. */
export type ISODate = string

export type WorkKind = 'strip' | 'layer' | 'roll' | 'card' | 'bath' | 'trim'

export type RegionState = 'no-record' | 'bare' | 'coming-in' | 'in-bloom' | 'past-peak'

export interface RegionProfile {
  key: string
  label: string
  sproutDays: number
  growDays: number
  holdDays: number
  weight: number
}

export interface CoatProfile {
  key: string
  label: string
  toleranceDays: number
  onTrackScore: number
  regions: RegionProfile[]
}

export interface CoatWork {
  date: ISODate
  kind: WorkKind
  regions: string[]
}

export interface RegionReadiness {
  region: string
  state: RegionState
  anchor: ISODate | null
  bloomStart: ISODate | null
  bloomEnd: ISODate | null
  score: number
}

export interface DogReadiness {
  showDate: ISODate
  score: number
  onTrack: boolean
  regions: RegionReadiness[]
}

export interface PlanStep {
  date: ISODate
  kind: WorkKind
  regions: string[]
  forShows: ISODate[]
  note: string
}

export interface Unreachable {
  showDate: ISODate
  region: string
  lastUsefulDate: ISODate
}

export interface WorkBackPlan {
  steps: PlanStep[]
  unreachable: Unreachable[]
}

export type RuleSet = 'AKC' | 'KC' | 'FCI'

export interface ClassCheck {
  code: string
  label: string
  eligible: boolean
  note?: string
}

/**
 * How a rule set words the upper age bound of a class:
 * 'under' excludes the day the dog reaches it (AKC "under twelve months"),
 * 'not-exceeding' includes it (KC "not exceeding nine calendar months"),
 * 'to' leaves it open (FCI "from 9 to 18 months").
 */
export type UpperBound = 'under' | 'not-exceeding' | 'to'

export interface ClassDefinition {
  code: string
  label: string
  /** Age in calendar months the dog must have reached on the first day of the show. */
  minMonths: number
  /** Upper age in calendar months, read as `upper` says; absent when the class has none. */
  maxMonths?: number
  upper?: UpperBound
  /** What the class asks beyond age (a title, a certificate, a win record), or a caveat. */
  note?: string
}

export interface RuleSetInfo {
  key: RuleSet
  label: string
  /** The rule text and edition the checks follow, and that the show's own schedule decides. */
  edition: string
}
