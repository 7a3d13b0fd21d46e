import { addCalendarMonths, classAgeWindow, CLASS_DEFINITIONS, MISSING_DAY_READINGS, ruleSetEdition, type ClassAgeWindow, type ISODate, type RuleSet } from '../coat'
import { startsLikeFormula } from '../csv'
import { resolveClassCode } from './classes'
import { detectDayOrder, readImportDate, type DayOrder } from './dates'
import { IMPORT_FIELD_LABELS, IMPORT_FIELDS, type ImportField, type ImportMapping } from './fields'
import type { ParsedCsv } from './parse'

/** A dog already in the organisation, as the matcher needs it. */
export interface KnownDog { id: number, registeredName: string, registrationNumber: string | null, dateOfBirth: ISODate, handlerId: number | null, callName?: string }
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
  /** An entry already there that the row leaves as it is. */
  unchangedEntry?: { id: number }
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
// By the field's place in IMPORT_FIELDS, read in the loop over every cell of every row.
const MAX_LENGTHS = IMPORT_FIELDS.map(f => MAX_LENGTH[f])
const DATE_FIELDS: ImportField[] = ['showFirstDay', 'showLastDay', 'entriesClose', 'dateOfBirth']
const ENTRY_FIELDS: ImportField[] = ['showName', 'showFirstDay', 'classCode']
// A common practical check (common practice, no source): one @, no spaces, a dot in the domain.
const EMAIL = /^[^\s@]+@[^\s@.]+(\.[^\s@.]+)+$/
const SEX: Record<string, 'dog' | 'bitch'> = { dog: 'dog', d: 'dog', male: 'dog', m: 'dog', bitch: 'bitch', b: 'bitch', female: 'bitch', f: 'bitch' }

const lower = (text: string) => text.trim().toLowerCase()

// Lookups by two or three parts use maps of maps rather than joined strings: a file of ten
// thousand rows would otherwise build and hash tens of thousands of throw-away keys.
function getIn<A, B, V>(map: Map<A, Map<B, V>>, a: A, b: B): V | undefined {
  return map.get(a)?.get(b)
}
function setIn<A, B, V>(map: Map<A, Map<B, V>>, a: A, b: B, value: V): void {
  let inner = map.get(a)
  if (!inner) map.set(a, inner = new Map())
  inner.set(b, value)
}

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
  return startImportPreview(parsed, context, choices).finish()
}

/** A preview read a part at a time: the same rows and counts as buildImportPreview, in order. */
export interface ImportPreviewRun {
  dayOrder: DayOrder
  dayOrderFromFile: boolean
  /** The next rows, at most `count` of them; an empty list once every row is read. */
  next: (count: number) => PreviewRow[]
  /** Reads the rows not read yet and gives the whole preview. */
  finish: () => ImportPreview
}

/**
 * Starts a preview that is read a part at a time, so the server can write one part while it
 * checks the next; each part's answer depends only on the rows before it, as in the whole.
 */
export function startImportPreview(parsed: ParsedCsv, context: ImportContext, choices: ImportChoices): ImportPreviewRun {
  const { mapping } = choices
  const column = new Map<ImportField, number>()
  for (const field of IMPORT_FIELDS) {
    const header = mapping[field]
    const index = header === undefined ? -1 : parsed.headers.indexOf(header)
    if (index >= 0) column.set(field, index)
  }
  // As plain lists: iterating the Map would make a pair per field per row.
  const columnFields = [...column.keys()]
  const columnIndexes = [...column.values()]
  const excluded = new Set(choices.exclude ?? [])
  const fixesByRow = new Map<number, Map<ImportField, string>>()
  for (const fix of choices.fixes ?? []) {
    if (!fixesByRow.has(fix.row)) fixesByRow.set(fix.row, new Map())
    fixesByRow.get(fix.row)!.set(fix.field, fix.value)
  }
  const valuesOf = (row: ParsedCsv['rows'][number]) => {
    const values: Partial<Record<ImportField, string>> = {}
    const cells = row.cells
    for (let i = 0; i < columnFields.length; i++) values[columnFields[i]!] = cells[columnIndexes[i]!] ?? ''
    // A fix wins over the cell, and may give a field the file has no column for.
    const fixed = fixesByRow.size ? fixesByRow.get(row.row) : undefined
    if (fixed) for (const [field, value] of fixed) values[field] = value
    return values
  }
  const allValues = parsed.rows.map(r => ({ row: r.row, values: valuesOf(r) }))

  // The order depends only on which values occur, so each distinct one is looked at once.
  const dateCells = new Set<string>()
  for (const { values } of allValues) {
    for (const field of DATE_FIELDS) dateCells.add(values[field] ?? '')
  }
  const detected = detectDayOrder(dateCells)
  const dayOrder: DayOrder = choices.dayOrder ?? detected.order ?? (context.ruleSet === 'AKC' ? 'month-first' : 'day-first')

  // By lower-case registration number; by lower-case registered name, then date of birth.
  const dogsByNumber = new Map<string, KnownDog>()
  const dogsByName = new Map<string, Map<ISODate, KnownDog>>()
  for (const dog of context.dogs) {
    if (dog.registrationNumber) dogsByNumber.set(lower(dog.registrationNumber), dog)
    setIn(dogsByName, lower(dog.registeredName), dog.dateOfBirth, dog)
  }
  // By lower-case name, then first day.
  const showsByName = new Map<string, Map<ISODate, KnownShow>>()
  for (const show of context.shows) setIn(showsByName, lower(show.name), show.firstDay, show)
  // By show id, then dog id, then class.
  const entriesByIds = new Map<number, Map<number, Map<string, KnownEntry>>>()
  for (const entry of context.entries) {
    let byDog = entriesByIds.get(entry.showId)
    if (!byDog) entriesByIds.set(entry.showId, byDog = new Map())
    setIn(byDog, entry.dogId, entry.classCode, entry)
  }
  const members = new Map(context.members.map(m => [lower(m.email), m.userId]))
  const newDogsByNumber = new Map<string, NewDog>()
  const newDogsByName = new Map<string, Map<ISODate, NewDog>>()
  const newShowsByName = new Map<string, Map<ISODate, NewShow>>()
  // One reference object per dog and show, shared by its rows' plans, so the rows already
  // entered can be found by reference: show, then dog, then class, to the row that entered it.
  const refs = new Map<KnownDog | NewDog | KnownShow | NewShow, Ref>()
  const idRef = (thing: KnownDog | KnownShow) => {
    let ref = refs.get(thing)
    if (!ref) refs.set(thing, ref = { id: thing.id })
    return ref
  }
  const keyRef = (thing: NewDog | NewShow) => {
    let ref = refs.get(thing)
    if (!ref) refs.set(thing, ref = { key: thing.key })
    return ref
  }
  const entryRows = new Map<Ref, Map<Ref, Map<string, number>>>()
  const enteredRow = (show: Ref, dog: Ref, code: string) => entryRows.get(show)?.get(dog)?.get(code)
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
  // Per birth date and class, the show days the dog is in by age: a dog entered in the same class
  // at many shows is worked out once, and each show is then two comparisons of ISO dates.
  const windows = new Map<ISODate, Map<string, ClassAgeWindow>>()
  const isOutside = (born: ISODate, firstDay: ISODate, code: string) => {
    let window = getIn(windows, born, code)
    if (!window) {
      window = classAgeWindow(context.ruleSet, code, born)
      setIn(windows, born, code, window)
    }
    return firstDay < window.from || (window.through !== null && firstDay > window.through)
  }

  // The row being read and its trimmed values: the helpers below are made once per file rather
  // than once per row, and `text` is one object cleared for each row.
  let row = 0
  let problems: ImportProblem[] = []
  const text: Partial<Record<ImportField, string>> = {}
  const problem = (field: ImportField | null, severity: ImportProblem['severity'], message: string) => {
    problems.push({ row, field, column: field ? mapping[field] ?? IMPORT_FIELD_LABELS[field] : null, severity, message })
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
    if (value === undefined) return undefined
    if (EMAIL.test(value)) return value
    problem(field, 'error', `Row ${row}, ${IMPORT_FIELD_LABELS[field]}: ${quoted(value)} is not an e-mail address.`)
    return undefined
  }

  const readRow = (line: { row: number, values: Partial<Record<ImportField, string>> }): PreviewRow => {
    const values = line.values
    row = line.row
    problems = []
    for (let f = 0; f < IMPORT_FIELDS.length; f++) {
      const field = IMPORT_FIELDS[f]!
      text[field] = undefined
      const raw = values[field]
      if (raw === undefined) continue
      const value = raw.trim()
      // A lone dash is a spreadsheet's "nothing here", not a formula.
      if (value === '' || value === '-' || value === '—') continue
      if (startsLikeFormula(raw) || (value !== raw && startsLikeFormula(value))) {
        problem(field, 'error', `Row ${row}, ${IMPORT_FIELD_LABELS[field]}: ${quoted(value)} starts like a spreadsheet formula (=, +, -, @); Bloomline does not import formulas, so type the value itself.`)
        continue
      }
      const max = MAX_LENGTHS[f]
      if (max && value.length > max) {
        problem(field, 'error', `Row ${row}, ${IMPORT_FIELD_LABELS[field]}: ${value.length} characters is too long; at most ${max}.`)
        continue
      }
      text[field] = value
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
    let inFileDog: NewDog | undefined
    const number = text.registrationNumber
    const numberKey = number ? lower(number) : undefined
    const nameKey = text.registeredName && dateOfBirth ? lower(text.registeredName) : undefined
    const known = (numberKey ? dogsByNumber.get(numberKey) : undefined) ?? (nameKey ? getIn(dogsByName, nameKey, dateOfBirth!) : undefined)
    if (known && number && known.registrationNumber && lower(known.registrationNumber) !== lower(number)) {
      problem('registrationNumber', 'warning', `Row ${row}, registration number: the dog with this name and date of birth is registered as ${known.registrationNumber} in Bloomline; that one is kept.`)
    }
    if (known) {
      dog = idRef(known)
      if (dateOfBirth && known.dateOfBirth !== dateOfBirth) {
        problem('dateOfBirth', 'warning', `Row ${row}, date of birth: the file says ${dateOfBirth}, Bloomline has ${known.dateOfBirth} for this dog; Bloomline's is kept.`)
      }
    }
    else if (text.registeredName) {
      inFileDog = (numberKey && newDogsByNumber.get(numberKey)) || (nameKey && getIn(newDogsByName, nameKey, dateOfBirth!)) || undefined
      if (inFileDog) {
        dog = keyRef(inFileDog)
      }
      else {
        required('breed', 'a new dog needs its breed')
        required('sex', 'a new dog needs its sex')
        required('dateOfBirth', 'a new dog needs its date of birth')
        if (text.breed && sex && dateOfBirth) {
          newDog = {
            key: `dog:${numberKey ? `n:${numberKey}` : `r:${nameKey}|${dateOfBirth}`}`,
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
          dog = keyRef(newDog)
        }
      }
    }
    const dogBorn = (known ?? newDog ?? inFileDog)?.dateOfBirth

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
        const name = lower(text.showName)
        const knownShow = getIn(showsByName, name, firstDay)
        if (knownShow) {
          show = idRef(knownShow)
          if (knownShow.entriesCloseAt) closed = { late: context.now.getTime() > Date.parse(knownShow.entriesCloseAt), when: knownShow.entriesCloseAt.slice(0, 10) }
        }
        else {
          const inFile = getIn(newShowsByName, name, firstDay)
          newShow = inFile ? undefined : {
            key: `show:${name}|${firstDay}`,
            name: text.showName,
            firstDay,
            lastDay: lastDay ?? firstDay,
            club: text.club ?? null,
            place: text.place ?? null,
            judges: judges(text.judge),
            entriesCloseDate: closeDate ?? null,
          }
          show = keyRef((inFile ?? newShow)!)
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
    let unchangedEntry: RowPlan['unchangedEntry']
    if (dog && show && classCode) {
      const earlier = enteredRow(show, dog, classCode)
      if (earlier !== undefined) problem('classCode', 'error', `Row ${row} repeats row ${earlier}: the same dog in the same class at the same show; leave one of them out.`)
      const existing = 'id' in show && 'id' in dog ? entriesByIds.get(show.id)?.get(dog.id)?.get(classCode) : undefined
      const armband = text.armband ?? null
      if (existing) {
        const handler = handlerId ?? existing.handlerId
        const changed = (armband !== null && armband !== existing.armband) || handler !== existing.handlerId
        if (changed) updateEntry = { id: existing.id, armband: armband ?? existing.armband, handlerId: handler }
        else unchangedEntry = { id: existing.id }
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
    const plan: RowPlan | null = !hasError && dog ? { dog, newDog, show, newShow, newEntry, updateEntry, unchangedEntry } : null
    if (!isExcluded && plan) {
      // Later rows reuse what this chosen row makes; a left-out row's dog or show is not made.
      if (newDog) {
        if (numberKey) newDogsByNumber.set(numberKey, newDog)
        setIn(newDogsByName, lower(newDog.registeredName), newDog.dateOfBirth, newDog)
      }
      if (newShow) setIn(newShowsByName, lower(newShow.name), newShow.firstDay, newShow)
      if (show && classCode) {
        let byDog = entryRows.get(show)
        if (!byDog) entryRows.set(show, byDog = new Map())
        setIn(byDog, dog!, classCode, row)
      }
    }
    return { row, values, actions, problems, excluded: isExcluded, plan }
  }

  const dayOrderFromFile = detected.order !== null && !choices.dayOrder
  const rows: PreviewRow[] = []
  const next = (count: number) => {
    const end = Math.min(rows.length + count, allValues.length)
    const part: PreviewRow[] = []
    while (rows.length < end) {
      const read = readRow(allValues[rows.length]!)
      rows.push(read)
      part.push(read)
    }
    return part
  }
  return {
    dayOrder,
    dayOrderFromFile,
    next,
    finish: () => {
      next(Number.POSITIVE_INFINITY)
      return { dayOrder, dayOrderFromFile, rows, counts: countRows(rows) }
    },
  }
}

// One pass over the rows: the file can have a hundred thousand of them.
function countRows(rows: readonly PreviewRow[]): ImportCounts {
  const newDogs = new Set<string>()
  const matchedDogs = new Set<number>()
  const newShows = new Set<string>()
  const matchedShows = new Set<number>()
  let chosen = 0
  let withErrors = 0
  let withWarnings = 0
  let newEntries = 0
  let updated = 0
  let unchanged = 0
  for (const r of rows) {
    if (r.problems.length) {
      if (r.problems.some(p => p.severity === 'error')) withErrors++
      if (r.problems.some(p => p.severity === 'warning')) withWarnings++
    }
    if (r.excluded) continue
    chosen++
    const plan = r.plan
    if (!plan) continue
    if ('key' in plan.dog) newDogs.add(plan.dog.key)
    else matchedDogs.add(plan.dog.id)
    if (plan.show) {
      if ('key' in plan.show) newShows.add(plan.show.key)
      else matchedShows.add(plan.show.id)
    }
    if (plan.newEntry) newEntries++
    if (plan.updateEntry) updated++
    if (r.actions.includes('unchanged')) unchanged++
  }
  return {
    rows: rows.length,
    chosen,
    excluded: rows.length - chosen,
    withErrors,
    withWarnings,
    newDogs: newDogs.size,
    matchedDogs: matchedDogs.size,
    newShows: newShows.size,
    matchedShows: matchedShows.size,
    newEntries,
    updated,
    unchanged,
  }
}
