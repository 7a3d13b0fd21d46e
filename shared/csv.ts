import Papa from 'papaparse'

/** What a CSV cell can be given: text, a number, a yes/no, or nothing (an empty cell). */
export type CsvValue = string | number | boolean | null | undefined

/** One column of an export: its header and how to read a row's cell. */
export interface CsvColumn<Row> {
  header: string
  value: (row: Row) => CsvValue
}

export interface CsvOptions {
  /** Start with a UTF-8 byte-order mark, so spreadsheets that guess the encoding read accents right. */
  bom?: boolean
}

/** RFC 4180 §3 registers text/csv; the charset says how the bytes are to be read. */
export const CSV_MEDIA_TYPE = 'text/csv;charset=utf-8'

// OWASP ASVS 5.0 V1.2.10 and CWE-1236: a spreadsheet takes a cell starting with = + - @ as a
// formula, and one starting with tab, carriage return or NUL may be trimmed into one.
const FORMULA_START = /^[=+\-@\t\r\0]/

/** Whether a piece of text would be read as a formula by a spreadsheet. */
export function startsLikeFormula(text: string): boolean {
  return FORMULA_START.test(text)
}

/**
 * A cell made safe for a spreadsheet: text that starts like a formula gets a leading single
 * quote (OWASP ASVS 5.0 V1.2.10). Finite numbers and booleans pass unchanged, so -5 stays the
 * number -5: its text is only a sign, digits, a point and an exponent, which no spreadsheet
 * runs. A number written as text ("-5") is neutralised like any other text. NaN and the
 * infinities become an empty cell; null and undefined too.
 */
export function neutraliseCell(value: CsvValue): string | number | boolean {
  if (value === null || value === undefined) return ''
  if (typeof value === 'number') return Number.isFinite(value) ? value : ''
  if (typeof value === 'boolean') return value
  return startsLikeFormula(value) ? `'${value}` : value
}

/**
 * Rows as RFC 4180 CSV: a header line, CRLF line breaks, fields quoted when they hold a comma,
 * a double quote or a line break (quotes doubled inside), every header and cell passed through
 * `neutraliseCell`, and neutralised cells quoted as well.
 */
export function toCsv<Row>(rows: readonly Row[], columns: readonly CsvColumn<Row>[], options: CsvOptions = {}): string {
  const header = columns.map(c => neutraliseCell(c.header))
  const body = rows.map(row => columns.map(c => neutraliseCell(c.value(row))))
  const text = Papa.unparse([header, ...body], {
    newline: '\r\n',
    quotes: value => typeof value === 'string' && value.startsWith('\'') && startsLikeFormula(value.slice(1)),
  })
  return options.bom ? `\uFEFF${text}` : text
}
