import type { H3Event } from 'h3'
import { CLASS_DEFINITIONS, type ISODate, type RuleSet } from '../../shared/coat'
import { CSV_MEDIA_TYPE, toCsv, type CsvColumn } from '../../shared/csv'
import { IMPORT_FIELD_LABELS, resolveClassCode, type ImportField } from '../../shared/import'
import { WORK_KIND_LABELS, type StoredRegion } from '../../shared/types/kennel'
import type { Caller } from './auth'
import { kennelSequelize } from './kennel'
import { selectRows } from './kennelData'
import type { WorkRecord } from './kennelViews'
import { entryScopeCondition } from './scope'
import { instantToWallClock } from './time'

/** One entry of a show with everything its export row needs, as the raw query reads it. */
export interface EntryExportRecord {
  showName: string
  showFirstDay: ISODate
  showLastDay: ISODate
  club: string | null
  place: string | null
  judges: string[] | null
  entriesCloseAt: Date | null
  showTimeZone: string
  registeredName: string
  callName: string
  registrationNumber: string | null
  breed: string
  sex: string
  dateOfBirth: ISODate
  ownerName: string | null
  ownerEmail: string | null
  handlerEmail: string | null
  classCode: string
  armband: string | null
  status: string
}

/**
 * The entries of one show that the caller may see (managers all of them, handlers those of the
 * dogs they see), by dog then class. The show itself must already have been checked as visible.
 */
export function loadShowEntriesForExport(caller: Caller, today: ISODate, showId: number): Promise<EntryExportRecord[]> {
  return selectRows<EntryExportRecord>(kennelSequelize(),
    `SELECT s.name AS "showName", to_char(s.first_day, 'YYYY-MM-DD') AS "showFirstDay", to_char(s.last_day, 'YYYY-MM-DD') AS "showLastDay",
       s.club, s.place, s.judges, s.entries_close_at AS "entriesCloseAt", s.time_zone AS "showTimeZone",
       d.registered_name AS "registeredName", d.call_name AS "callName", d.registration_number AS "registrationNumber",
       d.breed, d.sex, to_char(d.date_of_birth, 'YYYY-MM-DD') AS "dateOfBirth", d.owner_name AS "ownerName", d.owner_email AS "ownerEmail",
       u.email AS "handlerEmail", e.class_code AS "classCode", e.armband, e.status
     FROM entries e JOIN dogs d ON d.id = e.dog_id JOIN shows s ON s.id = e.show_id LEFT JOIN users u ON u.id = e.handler_id
     WHERE e.show_id = :showId AND ${entryScopeCondition(caller, today, 'e')}
     ORDER BY lower(d.registered_name), d.id, e.class_code, e.id`, { showId })
}

/**
 * A class as the export writes it: the rule set's label when the import engine reads that label
 * back as the same code, else the code itself, so an exported list always imports unchanged.
 */
export function exportClass(ruleSet: RuleSet, code: string): string {
  const label = CLASS_DEFINITIONS[ruleSet].find(c => c.code === code)?.label
  return label && resolveClassCode(ruleSet, label) === code ? label : code
}

const header = (field: ImportField) => IMPORT_FIELD_LABELS[field].charAt(0).toUpperCase() + IMPORT_FIELD_LABELS[field].slice(1)

/**
 * The columns of a show's entry export. Headers are the import engine's own field names
 * (IMPORT_FIELD_LABELS), so the file maps itself when imported back; a last "Status" column maps
 * to no field and is only read by people.
 */
export function entryExportColumns(ruleSet: RuleSet): CsvColumn<EntryExportRecord>[] {
  const column = (field: ImportField, value: CsvColumn<EntryExportRecord>['value']) => ({ header: header(field), value })
  return [
    column('showName', r => r.showName),
    column('showFirstDay', r => r.showFirstDay),
    column('showLastDay', r => r.showLastDay),
    column('club', r => r.club),
    column('place', r => r.place),
    // The importer splits judges on ";" (shared/import/preview.ts).
    column('judge', r => (r.judges ?? []).join('; ')),
    // Entries close as a date on the show's own wall clock, the form the importer reads.
    column('entriesClose', r => r.entriesCloseAt ? instantToWallClock(new Date(r.entriesCloseAt), r.showTimeZone).date : null),
    column('registeredName', r => r.registeredName),
    column('callName', r => r.callName),
    column('registrationNumber', r => r.registrationNumber),
    column('breed', r => r.breed),
    column('sex', r => r.sex),
    column('dateOfBirth', r => r.dateOfBirth),
    column('ownerName', r => r.ownerName),
    column('ownerEmail', r => r.ownerEmail),
    column('handlerEmail', r => r.handlerEmail),
    column('classCode', r => exportClass(ruleSet, r.classCode)),
    column('armband', r => r.armband),
    { header: 'Status', value: r => r.status },
  ]
}

/** The columns of a dog's coat-work export; regions by their profile labels where the profile has them. */
export function workExportColumns(regions: readonly StoredRegion[]): CsvColumn<WorkRecord>[] {
  const labels = new Map(regions.map(r => [r.key, r.label]))
  return [
    { header: 'Date', value: w => w.date },
    { header: 'Work', value: w => WORK_KIND_LABELS[w.kind]?.word ?? w.kind },
    { header: 'Regions', value: w => w.regions.map(r => labels.get(r) ?? r).join('; ') },
    { header: 'Minutes', value: w => w.minutes },
    { header: 'Worked by', value: w => w.workedByName },
    { header: 'Logged by', value: w => w.recordedByName },
    { header: 'Notes', value: w => w.notes },
  ]
}

/** A file-name part from free text: ASCII letters and digits joined by dashes, never empty. */
export function fileNamePart(text: string): string {
  const part = text.normalize('NFKD').replace(/[\u0300-\u036F]/g, '').toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60)
  return part || 'export'
}

/**
 * Sends rows as a CSV download: text/csv with its charset, an attachment with `fileName`, and a
 * UTF-8 byte-order mark like the grid's export, every cell neutralised (OWASP ASVS 5.0 V1.2.10).
 */
export function sendCsv<Row>(event: H3Event, fileName: string, rows: readonly Row[], columns: readonly CsvColumn<Row>[]): string {
  setResponseHeader(event, 'content-type', CSV_MEDIA_TYPE)
  // The name is ASCII (fileNamePart), so the plain filename parameter is enough (RFC 6266 §4.3).
  setResponseHeader(event, 'content-disposition', `attachment; filename="${fileName}"`)
  setResponseHeader(event, 'cache-control', 'private, no-store')
  return toCsv(rows, columns, { bom: true })
}
