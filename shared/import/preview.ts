import { addCalendarMonths, classEligibility, CLASS_DEFINITIONS, MISSING_DAY_READINGS, ruleSetEdition, type ISODate, type RuleSet } from '../coat'
import { startsLikeFormula } from '../csv'
import { resolveClassCode } from './classes'
import { detectDayOrder, readImportDate, type DayOrder } from './dates'
import { IMPORT_FIELD_LABELS, IMPORT_FIELDS, type ImportField, type ImportMapping } from './fields'
import type { ParsedCsv } from './parse'

/** A dog already in the organisation, as the matcher needs it. */
export interface KnownDog { id: number, registeredName: string, registrationNumber: string | null, dateOfBirth: ISODate, handlerId: number | null }
/** A show already in the organisation; `entriesCloseAt` is an ISO instant. */
export interface KnownShow { id: number, name: string, firstDay: ISODate, entriesCloseAt: string | null }
/** An entry already made. */
export interface KnownEntry { id: number, showId: number, dogId: number, classCode: string, armband: string | null, handlerId: number | null }
/** A member of the organisation, for handler e-mails. */
export interface KnownMember { userId: number, email: string }

/** What the organisation already has, and its rules and clock. */
export interface ImportContext {
  ruleSet: RuleSet
  today: ISODate
  now: Date
  dogs: readonly KnownDog[]
  shows: readonly KnownShow[]
  entries: readonly KnownEntry[]
  members: readonly KnownMember[]
}

/** A correction typed in the preview: the value of one field in one row. */
export interface ImportFix { row: number, field: ImportField, value: string }

/** What the user chose: the mapping, the day/month order, rows left out and fixes. */
export interface ImportChoices {
  mapping: ImportMapping
  dayOrder?: DayOrder
  exclude?: readonly number[]
  fixes?: readonly ImportFix[]
}

/** What a row will do. */
export type RowAction = 'new dog' | 'matched dog' | 'new show' | 'matched show' | 'new entry' | 'unchanged' | 'updated'

/** One problem of one row: errors keep the row out until fixed; warnings let it in. */
export interface ImportProblem {
  row: number
  field: ImportField | null
  column: string | null
  severity: 'error' | 'warning'
  message: string
}

/** A new dog made from a row. */
export interface NewDog { key: string, registeredName: string, callName: string, registrationNumber: string | null, breed: string, sex: 'dog' | 'bitch', dateOfBirth: ISODate, ownerName: string | null, ownerEmail: string | null, handlerId: number | null }
/** A new show made from a row; entries close at the end of `entriesCloseDate`. */
export interface NewShow { key: string, name: string, firstDay: ISODate, lastDay: ISODate, club: string | null, place: string | null, judges: string[], entriesCloseDate: ISODate | null }
/** A reference to a dog or show: an existing id or the key of a new one. */
export type Ref = { id: number } | { key: string }

/** What committing a row writes. */
export interface RowPlan {
  dog: Ref
  newDog?: NewDog
  show?: Ref
  newShow?: NewShow
  newEntry?: { classCode: string, armband: string | null, handlerId: number | null }
  updateEntry?: { id: number, armband: string | null, handlerId: number | null }
}

/** One row of the preview. */
export interface PreviewRow {
  row: number
  values: Partial<Record<ImportField, string>>
  actions: RowAction[]
  problems: ImportProblem[]
  excluded: boolean
  plan: RowPlan | null
}

/** How many rows do what. */
export interface ImportCounts {
  rows: number
  chosen: number
  excluded: number
  withErrors: number
  withWarnings: number
  newDogs: number
  matchedDogs: number
  newShows: number
  matchedShows: number
  newEntries: number
  updated: number
  unchanged: number
}

/** The preview of a whole file. */
export interface ImportPreview {
  dayOrder: DayOrder
  /** Whether the file's dates settled the order; when not, it came from the choice or the rule set's habit. */
  dayOrderFromFile: boolean
  rows: PreviewRow[]
  counts: ImportCounts
}

const MAX_LENGTH: Partial<Record<ImportField, number>> = {
  showName: 160, club: 160, place: 200, judge: 120, registeredName: 160, callName: 60,
  registrationNumber: 40, breed: 80, ownerName: 120, ownerEmail: 254, handlerEmail: 254, armband: 20, classCode: 60,
}
const DATE_FIELDS: ImportField[] = ['showFirstDay', 'showLastDay', 'entriesClose', 'dateOfBirth']
const ENTRY_FIELDS: ImportField[] = ['showName', 'showFirstDay', 'classCode']
// A common practical check (common practice, no source): one @, no spaces, a dot in the domain.
const EMAIL = /^[^\s@]+@[^\s@.]+(\.[^\s@.]+)+$/
const SEX: Record<string, 'dog' | 'bitch'> = { dog: 'dog', d: 'dog', male: 'dog', m: 'dog', bitch: 'bitch', b: 'bitch', female: 'bitch', f: 'bitch' }

const lower = (text: string) => text.trim().toLowerCase()
const showKey = (name: string, firstDay: string) => `${lower(name)}|${firstDay}`
const refKey = (ref: Ref) => 'id' in ref ? `#${ref.id}` : ref.key

function quoted(value: string): string {
  return `"${value.length > 40 ? `${value.slice(0, 40)}…` : value}"`
}

/** Splits a judge cell into names: "A; B", "A / B" and "A & B" name two judges. */
function judges(value: string | undefined): string[] {
  return value ? value.split(/\s*(?:;|\/|&|\band\b)\s*/).map(j => j.trim()).filter(Boolean) : []
}

function ageWords(months: number): string {
  return months % 12 === 0 && months >= 36 ? `${months / 12} years` : `${months} months`
}

/**
 * The preview of a parsed file: for each row what it will do and every problem, with row
 * number and column. Pure: the same call on the server at commit gives the same answer, so a
 * request that skips the preview meets the same checks.
 */
export function buildImportPreview(parsed: ParsedCsv, context: ImportContext, choices: ImportChoices): ImportPreview {
  const { mapping } = choices
  const column = new Map<ImportField, number>()
  for (const field of IMPORT_FIELDS) {
    const header = mapping[field]
    const index = header === undefined ? -1 : parsed.headers.indexOf(header)
    if (index >= 0) column.set(field, index)
  }
  const excluded = new Set(choices.exclude ?? [])
  const fixesByRow = new Map<number, Map<ImportField, string>>()
  for (const fix of choices.fixes ?? []) {
    if (!fixesByRow.has(fix.row)) fixesByRow.set(fix.row, new Map())
    fixesByRow.get(fix.row)!.set(fix.field, fix.value)
  }
  const valuesOf = (row: ParsedCsv['rows'][number]) => {
    const values: Partial<Record<ImportField, string>> = {}
    for (const [field, index] of column) values[field] = row.cells[index] ?? ''
    // A fix wins over the cell, and may give a field the file has no column for.
    for (const [field, value] of fixesByRow.get(row.row) ?? []) values[field] = value
    return values
  }
  const allValues = parsed.rows.map(r => ({ row: r.row, values: valuesOf(r) }))

  const detected = detectDayOrder(allValues.flatMap(r => DATE_FIELDS.map(f => r.values[f] ?? '')))
  const dayOrder: DayOrder = choices.dayOrder ?? detected.order ?? (context.ruleSet === 'AKC' ? 'month-first' : 'day-first')

  const dogsByNumber = new Map<string, KnownDog>()
  const dogsByName = new Map<string, KnownDog>()
  for (const dog of context.dogs) {
    if (dog.registrationNumber) dogsByNumber.set(lower(dog.registrationNumber), dog)
    dogsByName.set(`${lower(dog.registeredName)}|${dog.dateOfBirth}`, dog)
  }
  const showsByKey = new Map(context.shows.map(s => [showKey(s.name, s.firstDay), s]))
  const entriesByKey = new Map(context.entries.map(e => [`#${e.showId}|#${e.dogId}|${e.classCode}`, e]))
  const members = new Map(context.members.map(m => [lower(m.email), m.userId]))
  const newDogsByNumber = new Map<string, NewDog>()
  const newDogsByName = new Map<string, NewDog>()
  const newDogsByKey = new Map<string, NewDog>()
  const newShows = new Map<string, NewShow>()
  const entryRows = new Map<string, number>()
  const isEntryList = ENTRY_FIELDS.some(f => column.has(f))
  // A file names a few classes and shows for thousands of rows: each answer is worked out once.
  const classDefs = new Map(CLASS_DEFINITIONS[context.ruleSet].map(d => [d.code, d]))
  const classCodes = new Map<string, string | undefined>()
  const classOf = (cell: string) => {
    if (!classCodes.has(cell)) classCodes.set(cell, resolveClassCode(context.ruleSet, cell))
    return classCodes.get(cell)
  }
  const dates = new Map<string, ISODate | null>()
  const dateIn = (cell: string) => {
    if (!dates.has(cell)) dates.set(cell, readImportDate(cell, dayOrder))
    return dates.get(cell)!
  }
  // Per dog's birth date and show day, the classes the dog is outside of (usually none).
  const outside = new Map<string, ReadonlySet<string>>()
  const isOutside = (born: ISODate, firstDay: ISODate, code: string) => {
    const key = `${born}|${firstDay}`
    let codes = outside.get(key)
    if (!codes) {
      codes = new Set(classEligibility(context.ruleSet, born, firstDay).filter(c => !c.eligible).map(c => c.code))
      outside.set(key, codes)
    }
    return codes.has(code)
  }

  const rows = allValues.map(({ row, values }): PreviewRow => {
    const problems: ImportProblem[] = []
    const problem = (field: ImportField | null, severity: ImportProblem['severity'], message: string) => {
      problems.push({ row, field, column: field ? mapping[field] ?? IMPORT_FIELD_LABELS[field] : null, severity, message })
    }
    const text: Partial<Record<ImportField, string>> = {}
    for (const field of IMPORT_FIELDS) {
      const raw = values[field]
      if (raw === undefined) continue
      const value = raw.trim()
      // A lone dash is a spreadsheet's "nothing here", not a formula.
      if (value === '' || value === '-' || value === '—') continue
      if (startsLikeFormula(raw) || startsLikeFormula(value)) {
        problem(field, 'error', `Row ${row}, ${IMPORT_FIELD_LABELS[field]}: ${quoted(value)} starts like a spreadsheet formula (=, +, -, @); Bloomline does not import formulas, so type the value itself.`)
        continue
      }
      const max = MAX_LENGTH[field]
      if (max && value.length > max) {
        problem(field, 'error', `Row ${row}, ${IMPORT_FIELD_LABELS[field]}: ${value.length} characters is too long; at most ${max}.`)
        continue
      }
      text[field] = value
    }
    const required = (field: ImportField, why: string) => {
      if (text[field] === undefined && !problems.some(p => p.field === field)) {
        problem(field, 'error', `Row ${row}, ${IMPORT_FIELD_LABELS[field]}: missing; ${why}.`)
      }
    }
    const date = (field: ImportField): ISODate | undefined => {
      const value = text[field]
      if (value === undefined) return undefined
      const read = dateIn(value)
      if (!read) {
        problem(field, 'error', `Row ${row}, ${IMPORT_FIELD_LABELS[field]}: ${quoted(value)} is not a date Bloomline can read (dates are read ${dayOrder === 'day-first' ? 'day first, as 29/05/2027' : 'month first, as 05/29/2027'}; 2027-05-29 and 29 May 2027 also work).`)
      }
      return read ?? undefined
    }
    const email = (field: ImportField) => {
      const value = text[field]
      if (value !== undefined && !EMAIL.test(value)) problem(field, 'error', `Row ${row}, ${IMPORT_FIELD_LABELS[field]}: ${quoted(value)} is not an e-mail address.`)
      return value !== undefined && EMAIL.test(value) ? value : undefined
    }

    required('registeredName', 'every row needs the dog\'s registered name')
    const dateOfBirth = date('dateOfBirth')
    if (dateOfBirth && dateOfBirth > context.today) problem('dateOfBirth', 'error', `Row ${row}, date of birth: ${dateOfBirth} is after today.`)
    const ownerEmail = email('ownerEmail')
    const handlerEmail = email('handlerEmail')
    let handlerId: number | null = null
    if (handlerEmail) {
      handlerId = members.get(lower(handlerEmail)) ?? null
      if (handlerId === null) problem('handlerEmail', 'error', `Row ${row}, handler e-mail: ${quoted(handlerEmail)} is not a member of this organisation; invite them first or leave the handler out.`)
    }
    let sex: 'dog' | 'bitch' | undefined
    if (text.sex !== undefined) {
      sex = SEX[lower(text.sex)]
      if (!sex) problem('sex', 'error', `Row ${row}, sex: ${quoted(text.sex)} is neither dog nor bitch (D/B, male/female also work).`)
    }

    // Dogs match by registration number, then by registered name and date of birth.
    let dog: Ref | undefined
    let newDog: NewDog | undefined
    const number = text.registrationNumber
    const nameKey = text.registeredName && dateOfBirth ? `${lower(text.registeredName)}|${dateOfBirth}` : undefined
    const known = (number ? dogsByNumber.get(lower(number)) : undefined) ?? (nameKey ? dogsByName.get(nameKey) : undefined)
    if (known && number && known.registrationNumber && lower(known.registrationNumber) !== lower(number)) {
      problem('registrationNumber', 'warning', `Row ${row}, registration number: the dog with this name and date of birth is registered as ${known.registrationNumber} in Bloomline; that one is kept.`)
    }
    if (known) {
      dog = { id: known.id }
      if (dateOfBirth && known.dateOfBirth !== dateOfBirth) {
        problem('dateOfBirth', 'warning', `Row ${row}, date of birth: the file says ${dateOfBirth}, Bloomline has ${known.dateOfBirth} for this dog; Bloomline's is kept.`)
      }
    }
    else if (text.registeredName) {
      const inFile = (number && newDogsByNumber.get(lower(number))) || (nameKey && newDogsByName.get(nameKey)) || undefined
      if (inFile) {
        dog = { key: inFile.key }
      }
      else {
        required('breed', 'a new dog needs its breed')
        required('sex', 'a new dog needs its sex')
        required('dateOfBirth', 'a new dog needs its date of birth')
        if (text.breed && sex && dateOfBirth) {
          newDog = {
            key: `dog:${number ? `n:${lower(number)}` : `r:${nameKey}`}`,
            registeredName: text.registeredName,
            callName: (text.callName ?? text.registeredName).slice(0, 60),
            registrationNumber: number ?? null,
            breed: text.breed,
            sex,
            dateOfBirth,
            ownerName: text.ownerName ?? null,
            ownerEmail: ownerEmail ?? null,
            handlerId,
          }
          dog = { key: newDog.key }
        }
      }
    }
    const dogBorn = known?.dateOfBirth ?? newDog?.dateOfBirth ?? (dog && 'key' in dog ? newDogsByKey.get(dog.key)?.dateOfBirth : undefined)

    let show: Ref | undefined
    let newShow: NewShow | undefined
    let closed: { late: boolean, when: string } | undefined
    let firstDay: ISODate | undefined
    let classCode: string | undefined
    const rowIsEntry = isEntryList && ENTRY_FIELDS.some(f => text[f] !== undefined)
    if (rowIsEntry) {
      required('showName', 'an entry needs its show')
      required('showFirstDay', 'an entry needs the show\'s first day')
      required('classCode', 'an entry needs its class')
      firstDay = date('showFirstDay')
      const lastDay = date('showLastDay')
      const closeDate = date('entriesClose')
      if (firstDay && lastDay && lastDay < firstDay) problem('showLastDay', 'error', `Row ${row}, last day: ${lastDay} is before the first day, ${firstDay}.`)
      if (firstDay && closeDate && closeDate > firstDay) problem('entriesClose', 'error', `Row ${row}, entries close: ${closeDate} is after the show's first day, ${firstDay}.`)
      if (text.classCode !== undefined) {
        classCode = classOf(text.classCode)
        if (!classCode) {
          const labels = CLASS_DEFINITIONS[context.ruleSet].map(c => c.label).join(', ')
          problem('classCode', 'error', `Row ${row}, class: ${quoted(text.classCode)} is not a class of this organisation's rule set (${context.ruleSet}); use one of ${labels}, or a code such as ${CLASS_DEFINITIONS[context.ruleSet][0]!.code}.`)
        }
      }
      if (text.showName && firstDay) {
        const key = showKey(text.showName, firstDay)
        const knownShow = showsByKey.get(key)
        if (knownShow) {
          show = { id: knownShow.id }
          if (knownShow.entriesCloseAt) closed = { late: context.now.getTime() > Date.parse(knownShow.entriesCloseAt), when: knownShow.entriesCloseAt.slice(0, 10) }
        }
        else {
          const inFile = newShows.get(`show:${key}`)
          newShow = inFile ? undefined : {
            key: `show:${key}`,
            name: text.showName,
            firstDay,
            lastDay: lastDay ?? firstDay,
            club: text.club ?? null,
            place: text.place ?? null,
            judges: judges(text.judge),
            entriesCloseDate: closeDate ?? null,
          }
          show = { key: `show:${key}` }
          const close = (inFile ?? newShow)!.entriesCloseDate
          if (close) closed = { late: context.today > close, when: close }
        }
      }
    }

    const actions: RowAction[] = []
    if (dog) actions.push('id' in dog ? 'matched dog' : 'new dog')
    if (show) actions.push('id' in show ? 'matched show' : 'new show')
    let newEntry: RowPlan['newEntry']
    let updateEntry: RowPlan['updateEntry']
    if (dog && show && classCode) {
      const key = `${refKey(show)}|${refKey(dog)}|${classCode}`
      const earlier = entryRows.get(key)
      if (earlier !== undefined) problem('classCode', 'error', `Row ${row} repeats row ${earlier}: the same dog in the same class at the same show; leave one of them out.`)
      const existing = entriesByKey.get(key)
      const armband = text.armband ?? null
      if (existing) {
        const handler = handlerId ?? existing.handlerId
        const changed = (armband !== null && armband !== existing.armband) || handler !== existing.handlerId
        if (changed) updateEntry = { id: existing.id, armband: armband ?? existing.armband, handlerId: handler }
        actions.push(changed ? 'updated' : 'unchanged')
      }
      else {
        newEntry = { classCode, armband, handlerId: handlerId ?? known?.handlerId ?? null }
        actions.push('new entry')
        if (closed?.late) problem('entriesClose', 'warning', `Row ${row}, entries close: entries for this show closed on ${closed.when}; this entry is recorded after the closing date, so check the show accepts it.`)
      }
      if (dogBorn && firstDay) {
        if (isOutside(dogBorn, firstDay, classCode)) {
          const def = classDefs.get(classCode)!
          const young = addCalendarMonths(dogBorn, def.minMonths, MISSING_DAY_READINGS[context.ruleSet]) > firstDay
          const range = def.maxMonths === undefined ? `${ageWords(def.minMonths)} and over` : `${ageWords(def.minMonths)} to ${ageWords(def.maxMonths)}`
          problem('classCode', 'warning', `Row ${row}, class: born ${dogBorn}, the dog is too ${young ? 'young' : 'old'} for ${def.label} (${range}) on the show's first day, ${firstDay}. ${ruleSetEdition(context.ruleSet)}`)
        }
      }
    }
    else if (dog && !show && !rowIsEntry && 'id' in dog) {
      actions.push('unchanged')
    }

    const isExcluded = excluded.has(row)
    const hasError = problems.some(p => p.severity === 'error')
    const plan: RowPlan | null = !hasError && dog ? { dog, newDog, show, newShow, newEntry, updateEntry } : null
    if (!isExcluded && plan) {
      // Later rows reuse what this chosen row makes; a left-out row's dog or show is not made.
      if (newDog) {
        if (newDog.registrationNumber) newDogsByNumber.set(lower(newDog.registrationNumber), newDog)
        newDogsByName.set(`${lower(newDog.registeredName)}|${newDog.dateOfBirth}`, newDog)
        newDogsByKey.set(newDog.key, newDog)
      }
      if (newShow) newShows.set(newShow.key, newShow)
      if (show && classCode) entryRows.set(`${refKey(show)}|${refKey(dog!)}|${classCode}`, row)
    }
    return { row, values, actions, problems, excluded: isExcluded, plan }
  })

  return { dayOrder, dayOrderFromFile: detected.order !== null && !choices.dayOrder, rows, counts: countRows(rows) }
}

function countRows(rows: readonly PreviewRow[]): ImportCounts {
  const chosen = rows.filter(r => !r.excluded)
  const distinct = (pick: (r: PreviewRow) => string | undefined) => new Set(chosen.map(pick).filter(Boolean)).size
  return {
    rows: rows.length,
    chosen: chosen.length,
    excluded: rows.length - chosen.length,
    withErrors: rows.filter(r => r.problems.some(p => p.severity === 'error')).length,
    withWarnings: rows.filter(r => r.problems.some(p => p.severity === 'warning')).length,
    newDogs: distinct(r => r.plan && 'key' in r.plan.dog ? r.plan.dog.key : undefined),
    matchedDogs: distinct(r => r.plan && 'id' in r.plan.dog ? String(r.plan.dog.id) : undefined),
    newShows: distinct(r => r.plan?.show && 'key' in r.plan.show ? r.plan.show.key : undefined),
    matchedShows: distinct(r => r.plan?.show && 'id' in r.plan.show ? String(r.plan.show.id) : undefined),
    newEntries: chosen.filter(r => r.plan?.newEntry).length,
    updated: chosen.filter(r => r.plan?.updateEntry).length,
    unchanged: chosen.filter(r => r.plan && r.actions.includes('unchanged')).length,
  }
}
