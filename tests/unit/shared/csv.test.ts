import Papa from 'papaparse'
import { describe, expect, it } from 'vitest'
import { neutraliseCell, toCsv, type CsvColumn, type CsvValue } from '../../../shared/csv'

interface Line { name: string, value: CsvValue }
const columns: CsvColumn<Line>[] = [
  { header: 'Name', value: l => l.name },
  { header: 'Value', value: l => l.value },
]

/** Reads CSV back with papaparse's parser, which follows RFC 4180 (and reports what it cannot read). */
function parse(text: string): string[][] {
  const result = Papa.parse<string[]>(text, { delimiter: ',', newline: '\r\n' })
  expect(result.errors).toEqual([])
  return result.data
}

describe('neutraliseCell', () => {
  // OWASP ASVS 5.0 V1.2.10 and CWE-1236 name the first characters that make a spreadsheet run a cell:
  // = + - @ tab, carriage return and NUL; the remedy they give is a leading single quote.
  it.each([
    ['=', '=SUM(A1:A9)'],
    ['+', '+1+1'],
    ['-', '-2+3'],
    ['@', '@SUM(1)'],
    ['tab', '\t=1+1'],
    ['carriage return', '\r=1+1'],
    ['NUL', '\0=1+1'],
  ])('puts a single quote before text that starts with %s', (_name, text) => {
    expect(neutraliseCell(text)).toBe(`'${text}`)
  })

  it.each([
    ['a plain name', 'Bramble'],
    ['an = inside the text', 'a=b'],
    ['a hyphen inside the text', 'Wire-haired'],
    ['a leading space before =', ' =1'],
    ['a single quote already first', '\'quoted'],
    ['empty text', ''],
  ])('leaves %s as it is', (_name, text) => {
    expect(neutraliseCell(text)).toBe(text)
  })

  // Our decision (documented on neutraliseCell): a finite number's text cannot hold a formula, so a
  // negative number stays a number a spreadsheet can add up; the same characters sent as text are quoted.
  it.each([
    [-5, -5],
    [0, 0],
    [12.5, 12.5],
    [-1e-7, -1e-7],
  ])('keeps the number %s a number', (input, expected) => {
    expect(neutraliseCell(input)).toBe(expected)
  })

  it.each([
    ['null', null, ''],
    ['undefined', undefined, ''],
    ['NaN', Number.NaN, ''],
    ['Infinity', Number.POSITIVE_INFINITY, ''],
    ['-Infinity', Number.NEGATIVE_INFINITY, ''],
    ['true', true, true],
    ['text "-5"', '-5', '\'-5'],
  ])('writes %s as %j', (_name, input, expected) => {
    expect(neutraliseCell(input)).toBe(expected)
  })
})

describe('toCsv', () => {
  it('writes a header line and one line a row, with CRLF breaks (RFC 4180 §2.1, §2.3)', () => {
    const text = toCsv([{ name: 'Bramble', value: 3 }, { name: 'Thistle', value: null }], columns)
    expect(text.split('\r\n')).toEqual(['Name,Value', 'Bramble,3', 'Thistle,'])
    expect(text).not.toMatch(/(?<!\r)\n/)
  })

  // RFC 4180 §2.6: fields holding a comma, a double quote or a line break are enclosed in double quotes;
  // §2.7: a double quote inside is written twice.
  it.each([
    ['a comma', 'Hollow, North', '"Hollow, North"'],
    ['a double quote', 'the "big" one', '"the ""big"" one"'],
    ['a line feed', 'line one\nline two', '"line one\nline two"'],
    ['a CRLF', 'line one\r\nline two', '"line one\r\nline two"'],
  ])('quotes a field with %s', (_name, value, written) => {
    const text = toCsv([{ name: 'x', value }], columns)
    expect(text).toBe(`Name,Value\r\nx,${written}`)
    expect(parse(text)[1]).toEqual(['x', value])
  })

  it.each([
    ['=', '=HYPERLINK("http://bad.example","x")'],
    ['+', '+1'],
    ['-', '-1+2'],
    ['@', '@cmd'],
    ['tab', '\tx'],
    ['carriage return', '\rx'],
    ['NUL', '\0x'],
  ])('neutralises a cell starting with %s, quoted, and a spreadsheet reader gets back the text after a single quote', (_name, value) => {
    const text = toCsv([{ name: 'x', value }], columns)
    // OWASP's CSV injection guidance pairs the single quote with enclosing the field in double quotes.
    expect(text.startsWith('Name,Value\r\nx,"\'')).toBe(true)
    const read = parse(text)
    expect(read[1]![1]).toBe(`'${value}`)
    expect(read[1]![1]!.charAt(0)).toBe('\'')
  })

  it('neutralises headers too, and writes negative numbers as numbers', () => {
    const read = parse(toCsv([{ name: '=SUM(1)', value: -5 }], [
      { header: '-sides', value: (l: Line) => l.name },
      { header: 'Days', value: (l: Line) => l.value },
    ]))
    expect(read).toEqual([['\'-sides', 'Days'], ['\'=SUM(1)', '-5']])
  })

  it('starts with a byte-order mark only when asked', () => {
    expect(toCsv([], columns).charCodeAt(0)).toBe('N'.charCodeAt(0))
    const withMark = toCsv([], columns, { bom: true })
    expect(withMark.charCodeAt(0)).toBe(0xFEFF)
    expect(withMark.slice(1)).toBe('Name,Value')
  })

  it('keeps every row in order, whatever the text', () => {
    const lines: Line[] = Array.from({ length: 50 }, (_, i) => ({ name: `Dog ${i}, "${i % 3 ? 'a' : '='}"`, value: i % 2 ? -i : `${i}` }))
    const read = parse(toCsv(lines, columns))
    expect(read).toHaveLength(51)
    read.slice(1).forEach((cells, i) => {
      expect(cells[0]).toBe(lines[i]!.name)
      expect(cells[1]).toBe(String(lines[i]!.value))
    })
  })
})
