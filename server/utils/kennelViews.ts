import { CLASS_DEFINITIONS, classEligibility, ruleSetEdition, type ClassCheck, type DogReadiness, type ISODate, type RuleSet } from '../../shared/coat'
import type {
  CoatWorkLogItem, DogSummary, DogView, EntryStatus, EntryView, PersonRef, ProfileView, ShowRef, ShowView,
} from '../../shared/types/kennel'
import type { DogRecord, StoredProfile } from './kennelData'
import type { ScopeCaller } from './scope'
import { instantToWallClock } from './time'

// Explicit imports only, like the loaders: plain rows in, the shared API shapes out.

const person = (id: number | null, name: string | null | undefined): PersonRef | null =>
  id === null || id === undefined ? null : { id, name: name ?? '' }

/** A stored profile as the API shows it. */
export function profileView(profile: StoredProfile, dogCount: number): ProfileView {
  return {
    id: profile.id,
    key: profile.key,
    label: profile.label,
    toleranceDays: profile.toleranceDays,
    onTrackScore: profile.onTrackScore,
    regions: profile.regions,
    isDefault: profile.isDefault,
    dogCount,
  }
}

/** A dog row as lists show it, with its next show and its readiness for it. */
export function dogSummaryView(dog: DogRecord, nextShow: ShowRef | null, readiness: DogReadiness | null): DogSummary {
  return {
    id: dog.id,
    callName: dog.callName,
    registeredName: dog.registeredName,
    registrationNumber: dog.registrationNumber,
    breed: dog.breed,
    sex: dog.sex,
    dateOfBirth: dog.dateOfBirth,
    colour: dog.colour,
    status: dog.status,
    handler: person(dog.handlerId, dog.handlerName),
    coatProfileId: dog.coatProfileId,
    nextShow,
    readiness: readiness ? { score: readiness.score, onTrack: readiness.onTrack } : null,
  }
}

/** Whether the caller may change a dog's record: managers all of it, the dog's own handler its notes. */
export function mayEditDog(caller: ScopeCaller, dog: { handlerId: number | null }): boolean {
  return caller.role === 'manager' || (caller.role === 'handler' && dog.handlerId === caller.userId)
}

/** A dog with everything the caller may see of it: assistants get no owner contact. */
export function dogView(caller: ScopeCaller, summary: DogSummary, dog: DogRecord, profile: ProfileView): DogView {
  return {
    ...summary,
    owner: caller.role === 'assistant' ? null : { name: dog.ownerName, email: dog.ownerEmail, phone: dog.ownerPhone },
    notes: dog.notes,
    coatProfile: profile,
    can: {
      edit: mayEditDog(caller, dog),
      delete: caller.role === 'manager',
      logWork: true,
      seeEntries: caller.role !== 'assistant',
    },
  }
}

/** A coat-work row as the raw query reads it, with the names of the people on it. */
export interface WorkRecord {
  id: number
  dogId: number
  date: ISODate
  kind: CoatWorkLogItem['kind']
  regions: string[]
  workedById: number | null
  workedByName: string | null
  recordedById: number | null
  recordedByName: string | null
  minutes: number | null
  notes: string | null
  taskId: number | null
  createdAt: Date
  updatedAt: Date
  deletedAt: Date | null
  deletedById: number | null
  deletedByName: string | null
}

/** Whether the caller may change a piece of coat work: its author (who recorded it) or a manager. */
export function mayEditWork(caller: ScopeCaller, work: { recordedById: number | null }): boolean {
  return caller.role === 'manager' || work.recordedById === caller.userId
}

/** A piece of coat work as the log shows it. */
export function coatWorkView(caller: ScopeCaller, w: WorkRecord): CoatWorkLogItem {
  return {
    id: w.id,
    dogId: w.dogId,
    date: w.date,
    kind: w.kind,
    regions: w.regions,
    workedBy: person(w.workedById, w.workedByName),
    recordedBy: person(w.recordedById, w.recordedByName),
    minutes: w.minutes,
    notes: w.notes,
    taskId: w.taskId,
    createdAt: new Date(w.createdAt).toISOString(),
    updatedAt: new Date(w.updatedAt).toISOString(),
    canEdit: w.deletedAt === null && mayEditWork(caller, w),
    deletedAt: w.deletedAt ? new Date(w.deletedAt).toISOString() : null,
    deletedBy: person(w.deletedById, w.deletedByName),
  }
}

/** A show's stored fields. */
export interface ShowRecord {
  id: number
  name: string
  club: string | null
  firstDay: ISODate
  lastDay: ISODate
  place: string | null
  judges: string[]
  timeZone: string
  entriesCloseAt: Date | null
  notes: string | null
}

/** A show as the API shows it: entries close both as a UTC instant and on the show's own wall clock. */
export function showView(show: ShowRecord, entryCount: number): ShowView {
  const closeAt = show.entriesCloseAt ? new Date(show.entriesCloseAt) : null
  return {
    id: show.id,
    name: show.name,
    club: show.club,
    firstDay: show.firstDay,
    lastDay: show.lastDay,
    place: show.place,
    judges: show.judges ?? [],
    timeZone: show.timeZone,
    entriesCloseAt: closeAt ? closeAt.toISOString() : null,
    entriesClose: closeAt ? instantToWallClock(closeAt, show.timeZone) : null,
    notes: show.notes,
    entryCount,
  }
}

/** The definition of a class code in a rule set, or undefined when the rule set has no such class. */
export function classDefinition(ruleSet: RuleSet, code: string) {
  return CLASS_DEFINITIONS[ruleSet].find(c => c.code === code)
}

/** An entry row with its dog, show and handler, as the raw query reads it. */
export interface EntryRecord {
  id: number
  classCode: string
  armband: string | null
  status: EntryStatus
  handlerId: number | null
  handlerName: string | null
  notes: string | null
  createdAt: Date
  dogId: number
  dogCallName: string
  dogRegisteredName: string
  dogDateOfBirth: ISODate
  showId: number
  showName: string
  showFirstDay: ISODate
  showTimeZone: string
  showEntriesCloseAt: Date | null
}

/**
 * An entry with its age check for the class on the show's first day (under the organisation's
 * rule set, deferring to the schedule) and plain warnings: not eligible by age, entered after
 * entries closed, withdrawn, a class the rule set does not have.
 */
export function entryView(e: EntryRecord, ruleSet: RuleSet): EntryView {
  const definition = classDefinition(ruleSet, e.classCode)
  const warnings: string[] = []
  let eligibility: ClassCheck | null = null
  if (definition) {
    eligibility = classEligibility(ruleSet, e.dogDateOfBirth, e.showFirstDay).find(c => c.code === e.classCode) ?? null
    if (eligibility && !eligibility.eligible) {
      warnings.push(`${e.dogCallName} is not eligible for ${definition.label} by age on the show's first day, ${e.showFirstDay}. ${ruleSetEdition(ruleSet)}`)
    }
  }
  else {
    warnings.push(`${e.classCode} is not a class of the organisation's rule set (${ruleSet}); choose one of its classes.`)
  }
  const closeAt = e.showEntriesCloseAt ? new Date(e.showEntriesCloseAt) : null
  if (closeAt && new Date(e.createdAt) > closeAt) {
    const close = instantToWallClock(closeAt, e.showTimeZone)
    warnings.push(`Entered after entries closed (${close.date} ${close.time}, ${e.showTimeZone}); check that the show accepted it.`)
  }
  if (e.status === 'withdrawn') warnings.push('Withdrawn: the dog is not going to this show.')
  return {
    id: e.id,
    dog: { id: e.dogId, callName: e.dogCallName, registeredName: e.dogRegisteredName, dateOfBirth: e.dogDateOfBirth },
    show: { id: e.showId, name: e.showName, firstDay: e.showFirstDay },
    classCode: e.classCode,
    classLabel: definition?.label ?? e.classCode,
    armband: e.armband,
    status: e.status,
    handler: person(e.handlerId, e.handlerName),
    notes: e.notes,
    eligibility,
    warnings,
  }
}
