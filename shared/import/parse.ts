import Papa from 'papaparse'
import { ImportFileError } from './decode'

/** The most columns a file may have. */
export const MAX_IMPORT_COLUMNS = 200

/** One data row: its number as a spreadsheet shows it (the header is row 1) and its cells. */
export interface CsvRow {
  row: number
  cells: string[]
}

/** A parsed file: the delimiter found, the header names and the data rows (blank lines skipped). */
export interface ParsedCsv {
  delimiter: ',' | ';' | '\t'
  headers: string[]
  rows: CsvRow[]
}

const DELIMITERS = [',', ';', '\t'] as const
const DELIMITER_NAMES: Record<string, string> = { ',': 'commas', ';': 'semicolons', '\t': 'tabs' }

function listRows(rows: number[]): string {
  const shown = rows.slice(0, 10).join(', ')
  return rows.length > 10 ? `${shown} and ${rows.length - 10} more` : shown
}

/** Squeezes a header for comparing: case, spaces and punctuation do not count. */
export function headerKey(header: string): string {
  return header.normalize('NFKD').replace(/[\u0300-\u036F]/g, '').toLowerCase().replace(/[^a-z0-9]+/g, '')
}

/**
 * The delimiter that reads the file's first rows as a table: no stray quotes, at least two
 * columns, every row as wide as the header (the widest such table wins). Papaparse's own guess
 * misses a short file whose quoted cells hold another delimiter, as `"Ash; Vale";Open`.
 */
function tableDelimiter(text: string, newline: Newline): ParsedCsv['delimiter'] | undefined {
  let best: { delimiter: ParsedCsv['delimiter'], width: number } | undefined
  for (const delimiter of DELIMITERS) {
    const sample = Papa.parse<string[]>(text, { delimiter, newline, preview: 20, skipEmptyLines: 'greedy' })
    const width = sample.data[0]?.length ?? 0
    const table = width >= 2 && !sample.errors.some(e => e.type === 'Quotes') && sample.data.every(cells => cells.length === width)
    if (table && width > (best?.width ?? 0)) best = { delimiter, width }
  }
  return best?.delimiter
}

type Newline = '\r\n' | '\n' | '\r'

/**
 * The line ending papaparse 5.7 guesses for a text when given none (its guessLineEndings, in
 * papaparse.js): over the first megabyte with quoted parts taken out, "\n" if there is no "\r"
 * or a "\n" comes first, else "\r\n" when at least half the "\r" are followed by "\n", else
 * "\r". Worked out once and handed to each of the four parses, which would each guess again.
 */
function lineEnding(text: string): Newline {
  const head = text.substring(0, 1024 * 1024).replace(/"([^]*?)"/gm, '')
  const r = head.split('\r')
  const firstN = head.indexOf('\n')
  if (r.length === 1 || (firstN >= 0 && firstN < r[0]!.length)) return '\n'
  let withN = 0
  for (const part of r) if (part[0] === '\n') withN++
  return withN >= r.length / 2 ? '\r\n' : '\r'
}

/**
 * Parses CSV text with papaparse (RFC 4180 quoting, doubled quotes, line breaks in quoted
 * fields), finding the delimiter among comma, semicolon and tab and skipping blank lines.
 * Refuses (ImportFileError) a header-only file, one column only, unbalanced quotes, ragged
 * rows, duplicate headers and more than 200 columns, each with one sentence.
 */
export function parseImportCsv(text: string): ParsedCsv {
  const newline = lineEnding(text)
  const found = tableDelimiter(text, newline)
  const result = Papa.parse<string[]>(text, found ? { delimiter: found, newline, skipEmptyLines: false } : { delimitersToGuess: [...DELIMITERS], newline, skipEmptyLines: false })
  const quote = result.errors.find(e => e.type === 'Quotes')
  if (quote) {
    const row = (quote.row ?? 0) + 1
    throw new ImportFileError(quote.code === 'MissingQuotes'
      ? `Row ${row} opens a quoted field that never closes: a double quote (") is missing, so the rest of the file cannot be read.`
      : `Row ${row} has a double quote (") inside a field that is not written as two double quotes (""), so its columns cannot be told apart.`)
  }
  const delimiter = (DELIMITERS as readonly string[]).includes(result.meta.delimiter) ? result.meta.delimiter as ParsedCsv['delimiter'] : ','
  const records: CsvRow[] = []
  for (let i = 0; i < result.data.length; i++) {
    const cells = result.data[i]!
    if (cells.some(c => c.trim() !== '')) records.push({ row: i + 1, cells })
  }
  const header = records.shift()
  if (!header) throw new ImportFileError('The file is empty: there is nothing to import.')
  if (header.cells.length > MAX_IMPORT_COLUMNS) {
    throw new ImportFileError(`The header row has ${header.cells.length.toLocaleString('en-GB')} columns; Bloomline reads at most ${MAX_IMPORT_COLUMNS}, so remove the columns you do not need.`)
  }
  if (header.cells.length < 2) {
    const other = header.cells[0]?.match(/[|:^~]/)?.[0]
    throw new ImportFileError(`Only one column was found${other ? ` (the columns seem to be separated by "${other}")` : ''}; Bloomline reads columns separated by commas, semicolons or tabs.`)
  }
  const headers = header.cells.map((h, i) => h.trim() || `Column ${i + 1}`)
  const seen = new Map<string, string>()
  for (const h of headers) {
    const key = headerKey(h) || h
    const earlier = seen.get(key)
    if (earlier !== undefined) throw new ImportFileError(`Two columns have the same header, "${earlier}" and "${h}"; rename one so each column is known by its own name.`)
    seen.set(key, h)
  }
  if (!records.length) throw new ImportFileError('The file has a header row but no rows below it: there is nothing to import.')
  // A spreadsheet may add empty cells at the end of a row; only cells with content make a row ragged.
  const ragged = records.filter(r => r.cells.length !== headers.length && (r.cells.length < headers.length || r.cells.slice(headers.length).some(c => c.trim() !== '')))
  if (ragged.length) {
    const first = ragged[0]!
    throw new ImportFileError(`Row${ragged.length > 1 ? 's' : ''} ${listRows(ragged.map(r => r.row))} ha${ragged.length > 1 ? 've' : 's'} a different number of columns from the header (${headers.length}; row ${first.row} has ${first.cells.length}), read with ${DELIMITER_NAMES[delimiter]} between columns; check for a missing or extra ${delimiter === '\t' ? 'tab' : `"${delimiter}"`} or an unquoted one inside a value.`)
  }
  // Only a row with empty cells past the header's width needs cutting.
  return { delimiter, headers, rows: records.map(r => r.cells.length === headers.length ? r : { row: r.row, cells: r.cells.slice(0, headers.length) }) }
}
