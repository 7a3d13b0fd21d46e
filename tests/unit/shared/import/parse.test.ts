import { describe, expect, it } from 'vitest'
import { decodeImportFile, ImportFileError, MAX_IMPORT_BYTES, parseImportCsv, readImportFile } from '../../../../shared/import'

/**
 * A small reader written straight from RFC 4180 §2 (records end at CRLF or LF, fields split on
 * the delimiter, a field in double quotes may hold delimiters, line breaks and doubled quotes),
 * as the second parser the papaparse reading is compared with. Blank lines are dropped.
 */
function rfc4180(text: string, delimiter = ','): string[][] {
  const records: string[][] = []
  let field = ''
  let record: string[] = []
  let quoted = false
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') { field += '"'; i++ }
      else if (c === '"') quoted = false
      else field += c
    }
    else if (c === '"' && field === '') quoted = true
    else if (c === delimiter) { record.push(field); field = '' }
    else if (c === '\n' || c === '\r') {
      if (c === '\r' && text[i + 1] === '\n') i++
      record.push(field)
      records.push(record)
      record = []
      field = ''
    }
    else field += c
  }
  if (field !== '' || record.length) { record.push(field); records.push(record) }
  return records.filter(r => r.some(f => f.trim() !== ''))
}

const utf8 = (text: string) => new TextEncoder().encode(text)

describe('parsing against RFC 4180 and a second reader', () => {
  // RFC 4180 §2.6: "Fields containing line breaks (CRLF), double quotes, and commas should be enclosed in double-quotes."
  // RFC 4180 §2.7: "a double-quote appearing inside a field must be escaped by preceding it with another double quote."
  it.each([
    ['§2.6 (line break and comma in quoted fields)', '"aaa","b\r\nbb","ccc"\r\nzzz,yyy,xxx\r\n'],
    ['§2.7 (doubled quote)', '"aaa","b""bb","ccc"\r\nzzz,yyy,xxx\r\n'],
    ['§2.1 and §2.2 (last record without a line break)', 'aaa,bbb,ccc\r\nzzz,yyy,xxx'],
    ['blank lines between records', 'aaa,bbb\r\n\r\nzzz,yyy\r\n\r\n'],
  ])('%s reads as the RFC reader does', (_name, text) => {
    const parsed = parseImportCsv(text)
    expect([parsed.headers, ...parsed.rows.map(r => r.cells)]).toEqual(rfc4180(text))
  })

  it.each([[';'], ['\t'], [',']])('finds the delimiter %j and reads as the RFC reader does', (delimiter) => {
    const text = ['Show', 'Registered name', 'Class'].join(delimiter) + '\r\n' + ['"Ash; Vale, Open"', '"Fern ""Q"" Whistle"', 'Open'].join(delimiter) + '\r\n'
    const parsed = parseImportCsv(text)
    expect(parsed.delimiter).toBe(delimiter)
    expect([parsed.headers, ...parsed.rows.map(r => r.cells)]).toEqual(rfc4180(text, delimiter))
  })

  it('numbers rows as a spreadsheet shows them, counting blank lines and the header as row 1', () => {
    const parsed = parseImportCsv('a,b\r\n1,2\r\n\r\n"x\r\ny",3\r\n4,5\r\n')
    expect(parsed.rows.map(r => r.row)).toEqual([2, 4, 5])
  })
})

describe('decoding', () => {
  it('drops a UTF-8 byte-order mark', () => {
    expect(decodeImportFile(utf8('\uFEFFName,Class\r\nRenée,Open')).text.startsWith('Name')).toBe(true)
  })

  it('reads Windows-1252 bytes that are not UTF-8 (é is 0xE9 in Windows-1252, from memory of the code page)', () => {
    const decoded = decodeImportFile(new Uint8Array([0x4E, 0x2C, 0x43, 0x0A, 0x52, 0x65, 0x6E, 0xE9, 0x65, 0x2C, 0x4F]))
    expect(decoded).toEqual({ text: 'N,C\nRenée,O', encoding: 'windows-1252' })
  })

  it('refuses a file of 10 MB and one byte, and takes one of exactly 10 MB', () => {
    const line = utf8('Fernwhistle Quillon,Open\n')
    const build = (size: number) => {
      const bytes = new Uint8Array(size).fill(0x20)
      bytes.set(utf8('Registered name,Class\n'))
      for (let at = 30; at + line.length < size; at += 1_000_000) bytes.set(line, at)
      return bytes
    }
    expect(() => decodeImportFile(build(MAX_IMPORT_BYTES + 1))).toThrow(/up to 10 MB/)
    expect(() => decodeImportFile(build(MAX_IMPORT_BYTES))).not.toThrow()
  })

  it('refuses a million columns within a few seconds', () => {
    const started = Date.now()
    const header = Array.from({ length: 1_000_000 }, () => 'c').join(',')
    expect(() => readImportFile(utf8(`${header}\n${header}\n`))).toThrow(/1,000,000 columns; Bloomline reads at most 200/)
    expect(Date.now() - started).toBeLessThan(5000)
  })

  it('gives an ImportFileError, never another kind of error', () => {
    expect(() => readImportFile(new Uint8Array())).toThrow(ImportFileError)
  })
})
