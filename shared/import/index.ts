import { toCsv } from '../csv'
import { decodeImportFile, type ImportEncoding } from './decode'
import { parseImportCsv, type ParsedCsv } from './parse'
import type { PreviewRow } from './preview'

export { resolveClassCode } from './classes'
export { detectDayOrder, readImportDate, type DayOrder } from './dates'
export { decodeImportFile, ImportFileError, MAX_IMPORT_BYTES, type ImportEncoding } from './decode'
export { fieldForHeader, IMPORT_FIELD_LABELS, IMPORT_FIELDS, proposeMapping, type ImportField, type ImportMapping } from './fields'
export { headerKey, MAX_IMPORT_COLUMNS, parseImportCsv, type CsvRow, type ParsedCsv } from './parse'
export * from './preview'
export { importMappingSchema, importRequestSchema, type ImportRequest } from './schema'

/** Decodes and parses an uploaded file's bytes; throws ImportFileError with one sentence when the file cannot be imported. */
export function readImportFile(bytes: Uint8Array): ParsedCsv & { encoding: ImportEncoding } {
  const { text, encoding } = decodeImportFile(bytes)
  return { ...parseImportCsv(text), encoding }
}

/** A row left out of an import: its cells by header and why. */
export interface LeftOutRow { row: number, cells: Record<string, string>, reasons: string[] }

/** The rows of a preview that were left out, with their reasons (their errors, or the user's choice). */
export function leftOutRows(parsed: ParsedCsv, rows: readonly PreviewRow[]): LeftOutRow[] {
  const byRow = new Map(parsed.rows.map(r => [r.row, r.cells]))
  return rows.filter(r => r.excluded || !r.plan).map((r) => {
    const cells = byRow.get(r.row) ?? []
    const errors = r.problems.filter(p => p.severity === 'error').map(p => p.message)
    return {
      row: r.row,
      cells: Object.fromEntries(parsed.headers.map((h, i) => [h, cells[i] ?? ''])),
      reasons: r.excluded ? ['Left out by choice.', ...errors] : errors,
    }
  })
}

/** The left-out rows as CSV: the row number, the file's own columns, then the reasons; every cell neutralised (OWASP ASVS 5.0 V1.2.10). */
export function leftOutCsv(headers: readonly string[], rows: readonly LeftOutRow[]): string {
  return toCsv(rows, [
    { header: 'Row', value: r => r.row },
    ...headers.map(h => ({ header: h, value: (r: LeftOutRow) => r.cells[h] ?? '' })),
    { header: 'Reasons', value: r => r.reasons.join(' ') },
  ], { bom: true })
}
export type { ImportCommitView, ImportedDog, ImportedShow, ImportHistoryView, ImportPreviewView } from './views'
