import { headerKey } from './parse'

/** Bloomline's fields a file's columns can be mapped to. */
export const IMPORT_FIELDS = [
  'showName', 'showFirstDay', 'showLastDay', 'club', 'place', 'judge', 'entriesClose',
  'registeredName', 'callName', 'registrationNumber', 'breed', 'sex', 'dateOfBirth',
  'ownerName', 'ownerEmail', 'handlerEmail', 'classCode', 'armband',
] as const

export type ImportField = typeof IMPORT_FIELDS[number]

/** Which file column (by header) feeds each field; a field left out is not read. */
export type ImportMapping = Partial<Record<ImportField, string>>

/** The field's name as the page shows it. */
export const IMPORT_FIELD_LABELS: Record<ImportField, string> = {
  showName: 'show name',
  showFirstDay: 'show first day',
  showLastDay: 'last day',
  club: 'club',
  place: 'place',
  judge: 'judge',
  entriesClose: 'entries close',
  registeredName: 'dog registered name',
  callName: 'call name',
  registrationNumber: 'registration number',
  breed: 'breed',
  sex: 'sex',
  dateOfBirth: 'date of birth',
  ownerName: 'owner name',
  ownerEmail: 'owner e-mail',
  handlerEmail: 'handler e-mail',
  classCode: 'class',
  armband: 'armband',
}

// Common ways spreadsheets name each column (common practice, no source); compared squeezed by headerKey.
const SYNONYMS: Record<ImportField, string[]> = {
  showName: ['show', 'show name', 'event', 'event name', 'show title'],
  showFirstDay: ['show first day', 'first day', 'show date', 'date of show', 'show day', 'start date', 'show start', 'event date'],
  showLastDay: ['last day', 'show last day', 'end date', 'show end', 'to date'],
  club: ['club', 'society', 'organiser', 'organizer', 'host club', 'show society'],
  place: ['place', 'venue', 'location', 'show venue', 'ground'],
  judge: ['judge', 'judges', 'judge name', 'breed judge'],
  entriesClose: ['entries close', 'closing date', 'entry close', 'close date', 'entries closing', 'closing'],
  registeredName: ['registered name', 'dog registered name', 'dog', 'dog name', 'name of dog', 'kennel name', 'reg name'],
  callName: ['call name', 'pet name', 'known as', 'nickname', 'callname'],
  registrationNumber: ['registration number', 'reg no', 'registration no', 'reg number', 'registration', 'reg', 'reg num', 'stud book number'],
  breed: ['breed', 'dog breed'],
  sex: ['sex', 'gender', 'dog bitch', 'd b'],
  dateOfBirth: ['date of birth', 'dob', 'born', 'birth date', 'birthday', 'whelped', 'date whelped', 'birthdate'],
  ownerName: ['owner', 'owner name', 'owners', 'registered owner', 'owner s name'],
  ownerEmail: ['owner email', 'owner e mail', 'email', 'e mail', 'owner mail', 'contact email'],
  handlerEmail: ['handler email', 'handler e mail', 'handler', 'handled by'],
  classCode: ['class', 'class code', 'classes', 'class entered', 'entered class', 'class name'],
  armband: ['armband', 'arm band', 'ring number', 'ring no', 'catalogue number', 'catalog number', 'number'],
}

const BY_KEY = new Map<string, ImportField>()
for (const field of IMPORT_FIELDS) for (const s of [field, IMPORT_FIELD_LABELS[field], ...SYNONYMS[field]]) if (!BY_KEY.has(headerKey(s))) BY_KEY.set(headerKey(s), field)

/** The field a header names, when it is one of the known names or synonyms. */
export function fieldForHeader(header: string): ImportField | undefined {
  return BY_KEY.get(headerKey(header))
}

/**
 * A proposed mapping from a file's headers: a remembered mapping first (for headers the file
 * has), then each header's own name or synonym; no field takes two columns.
 */
export function proposeMapping(headers: readonly string[], remembered: ImportMapping = {}): ImportMapping {
  const mapping: ImportMapping = {}
  const used = new Set<string>()
  const byKey = new Map(headers.map(h => [headerKey(h), h]))
  for (const field of IMPORT_FIELDS) {
    const header = remembered[field] && byKey.get(headerKey(remembered[field]!))
    if (header && !used.has(header)) {
      mapping[field] = header
      used.add(header)
    }
  }
  for (const header of headers) {
    const field = fieldForHeader(header)
    if (field && !mapping[field] && !used.has(header)) {
      mapping[field] = header
      used.add(header)
    }
  }
  return mapping
}
