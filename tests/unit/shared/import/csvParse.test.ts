import { readFileSync, readdirSync } from 'node:fs'
import { join } from 'node:path'
import { parse } from 'csv-parse/sync'
import { describe, expect, it } from 'vitest'
import { decodeImportFile, parseImportCsv } from '../../../../shared/import'

// A second, independent parser from npm (csv-parse, the node-csv project) must read every file
// exactly as Bloomline's papaparse-based reader does: RFC 4180 quoting (§2.5–2.7), the delimiter
// Bloomline detected, a UTF-8 byte-order mark dropped, blank lines skipped. Bloomline trims the
// spaces around header names (so " Show name " maps like "Show name"); cells are kept as written.
function readWithCsvParse(text: string, delimiter: string): string[][] {
  const [header = [], ...rows] = parse(text, { delimiter, bom: true, skip_empty_lines: true, relax_quotes: false }) as string[][]
  return [header.map(h => h.trim()), ...rows]
}

const goodDir = join(import.meta.dirname, '..', '..', '..', 'fixtures', 'csv', 'good')

describe('Bloomline reads CSV the way csv-parse does', () => {
  it.each([
    // RFC 4180 §2.6 and §2.7, the RFC's own examples.
    ['RFC 4180 §2.6', '"aaa","b\r\nbb","ccc"\r\nzzz,yyy,xxx\r\n'],
    ['RFC 4180 §2.7', '"aaa","b""bb","ccc"\r\nzzz,yyy,xxx\r\n'],
    ['semicolons with a quoted semicolon', 'Show;Class\r\n"Ash; Vale";Open\r\n'],
    ['tabs and a quoted line break', 'Show\tNotes\r\nVale\t"two\nlines"\r\n'],
  ])('%s', (_name, text) => {
    const ours = parseImportCsv(text)
    expect([ours.headers, ...ours.rows.map(r => r.cells)]).toEqual(readWithCsvParse(text, ours.delimiter))
  })

  it.each(readdirSync(goodDir))('the messy demo file %s', (file) => {
    const { text } = decodeImportFile(new Uint8Array(readFileSync(join(goodDir, file))))
    const ours = parseImportCsv(text)
    expect([ours.headers, ...ours.rows.map(r => r.cells)]).toEqual(readWithCsvParse(text, ours.delimiter))
  })
})
