import { readdirSync, readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import { CLASS_DEFINITIONS, ruleSetEdition } from '../../../../shared/coat'
import { neutraliseCell } from '../../../../shared/csv'
import { buildImportPreview, ImportFileError, leftOutCsv, leftOutRows, proposeMapping, readImportFile, type ImportContext } from '../../../../shared/import'

const corpus = fileURLToPath(new URL('../../../fixtures/csv/', import.meta.url))
const read = (path: string) => readFileSync(corpus + path)
const empty: ImportContext = { ruleSet: 'KC', today: '2026-12-01', now: new Date('2026-12-01T12:00:00Z'), dogs: [], shows: [], entries: [], members: [] }

function preview(bytes: Uint8Array, context = empty) {
  const parsed = readImportFile(bytes)
  return { parsed, preview: buildImportPreview(parsed, context, { mapping: proposeMapping(parsed.headers) }) }
}

// Each bad file and a part of the one sentence it must give (file-wide refusals) or of a row's problem.
const BAD: [string, RegExp][] = [
  ['empty.csv', /file is empty/],
  ['whitespace-only.csv', /file is empty/],
  ['header-only.csv', /header row but no rows/],
  ['header-only-blank-lines.csv', /header row but no rows/],
  ['binary-junk.csv', /binary data/],
  ['control-characters.csv', /control characters/],
  ['windows-1252-undefined-bytes.csv', /control characters/],
  ['utf16-bom.csv', /UTF-16/],
  ['wrong-delimiter-pipe.csv', /separated by "\|"/],
  ['single-column.csv', /Only one column/],
  ['unbalanced-quotes.csv', /Row 2 opens a quoted field that never closes/],
  ['stray-quote.csv', /Row 2 has a double quote/],
  ['ragged-rows.csv', /Rows 3, 5 have a different number of columns/],
  ['unquoted-comma.csv', /Row 2 has a different number of columns/],
  ['duplicate-headers.csv', /same header, "Class" and "class"/],
  ['duplicate-headers-spacing.csv', /same header/],
  ['too-many-columns.csv', /201 columns/],
  ['mixed-encodings.csv', /mixes two text encodings/],
  ['bom-then-windows-1252.csv', /mixes two text encodings/],
  ['formula-cells.csv', /Row 2, dog registered name: .* starts like a spreadsheet formula/],
  ['impossible-date.csv', /Row 2, show first day: "31\/02\/2027" is not a date/],
  ['impossible-birth-date.csv', /Row 2, date of birth: "30\/02\/2024" is not a date/],
  ['unreadable-dates.csv', /"next Tuesday" is not a date/],
  ['unknown-class.csv', /"Wizard Stakes" is not a class of this organisation's rule set \(KC\)/],
  ['other-rule-set-class.csv', /"akc:12-18" is not a class/],
  ['missing-required.csv', /Row 2, show name: missing/],
  ['bad-emails.csv', /"not an address" is not an e-mail address/],
  ['duplicate-rows.csv', /Row 3 repeats row 2/],
  ['bad-sex.csv', /"puppy" is neither dog nor bitch/],
  ['last-day-before-first.csv', /last day: 2027-05-28 is before the first day/],
  ['too-long-values.csv', /too long; at most 160/],
  ['born-in-future.csv', /after today/],
  ['close-after-first-day.csv', /after the show's first day/],
]

describe('the bad-file corpus', () => {
  it('lists every file in tests/fixtures/csv/bad, at least 30', () => {
    expect(BAD.map(b => b[0]).sort()).toEqual(readdirSync(`${corpus}bad`).sort())
    expect(BAD.length).toBeGreaterThanOrEqual(30)
  })

  it.each(BAD)('%s gives a clear message and nothing to write, quickly', (file, message) => {
    const started = Date.now()
    let messages: string[]
    let writable = 0
    try {
      const { preview: p } = preview(read(`bad/${file}`))
      messages = p.rows.flatMap(r => r.problems.filter(x => x.severity === 'error').map(x => x.message))
      // The rows with the problem cannot be written (a duplicate's first row still can).
      writable = p.rows.filter(r => r.plan && r.problems.some(x => message.test(x.message))).length
    }
    catch (error) {
      expect(error).toBeInstanceOf(ImportFileError)
      messages = [(error as Error).message]
    }
    expect(messages.some(m => message.test(m)), messages.join('\n')).toBe(true)
    // One sentence each: it ends with a full stop and names no code word.
    for (const m of messages) expect(m).toMatch(/[.)]$/)
    expect(writable).toBe(0)
    expect(Date.now() - started).toBeLessThan(3000)
  })

  it('puts every problem on its own line with the row number and column', () => {
    const { preview: p } = preview(read('bad/missing-required.csv'))
    const problems = p.rows.flatMap(r => r.problems)
    expect(problems.map(x => [x.row, x.column])).toEqual([[2, 'Show'], [3, 'Registered name'], [4, 'Breed'], [4, 'Sex'], [4, 'Date of birth']])
  })
})

describe('good messy files', () => {
  it('reads a semicolon file with a byte-order mark, messy headers, doubled quotes and a line break in a field', () => {
    const { parsed, preview: p } = preview(read('good/messy-semicolon-bom.csv'))
    expect(parsed.delimiter).toBe(';')
    expect(p.rows.map(r => r.values.showName)).toEqual(['Harrowgate "Spring" Open', 'Harrowgate "Spring" Open'])
    expect(p.rows.map(r => r.actions)).toEqual([['new dog', 'new show', 'new entry'], ['new dog', 'new show', 'new entry']])
    expect(p.counts).toMatchObject({ newDogs: 2, newShows: 1, newEntries: 2, withErrors: 0 })
  })

  it('reads a Windows-1252 tab-separated .txt file', () => {
    const { parsed, preview: p } = preview(read('good/windows-1252-tabs.txt'))
    expect(parsed).toMatchObject({ encoding: 'windows-1252', delimiter: '\t' })
    expect(p.rows[0]!.values).toMatchObject({ showName: 'Northfold Fête', registeredName: 'Fernwhistle Émile' })
  })

  it('chooses month first for a file whose dates decide it', () => {
    const { preview: p } = preview(read('good/month-first.csv'))
    expect(p).toMatchObject({ dayOrder: 'month-first', dayOrderFromFile: true })
    expect(p.counts.withErrors).toBe(0)
  })

  it('imports a dog list with no show columns as dogs only', () => {
    const { preview: p } = preview(read('good/dogs-only.csv'))
    expect(p.rows[0]!.actions).toEqual(['new dog'])
  })
})

describe('matching and actions', () => {
  const csv = (rows: string[]) => new TextEncoder().encode(['Show,First day,Registered name,Registration number,Breed,Sex,Date of birth,Class,Armband', ...rows].join('\r\n'))
  const known: ImportContext = {
    ...empty,
    dogs: [
      { id: 1, registeredName: 'Fernwhistle Quillon', registrationNumber: 'QX1', dateOfBirth: '2024-03-12', handlerId: null },
      { id: 2, registeredName: 'Fernwhistle Rowan', registrationNumber: null, dateOfBirth: '2023-01-05', handlerId: null },
    ],
    shows: [{ id: 9, name: 'Thornbury Open', firstDay: '2027-05-29', entriesCloseAt: '2026-11-01T23:59:00Z' }],
    entries: [{ id: 5, showId: 9, dogId: 1, classCode: 'kc:open', armband: '7', handlerId: null }],
  }

  it.each([
    ['by registration number, whatever the name', 'Thornbury Open,29/05/2027,Another Name,qx1,,,,Open,7', ['matched dog', 'matched show', 'unchanged']],
    ['an existing entry with a new armband is updated', 'Thornbury Open,29/05/2027,Fernwhistle Quillon,QX1,,,,kc:open,8', ['matched dog', 'matched show', 'updated']],
    ['by registered name and date of birth', 'THORNBURY OPEN,2027-05-29,fernwhistle rowan,,,,05/01/2023,Open,', ['matched dog', 'matched show', 'new entry']],
    ['a show of the same name on another day is new', 'Thornbury Open,30/05/2027,Fernwhistle Quillon,QX1,,,,Open,', ['matched dog', 'new show', 'new entry']],
  ])('matches %s', (_name, row, actions) => {
    expect(buildImportPreview(readImportFile(csv([row])), known, { mapping: proposeMapping(readImportFile(csv([row])).headers) }).rows[0]!.actions).toEqual(actions)
  })

  it('warns of an entry made after the show\'s closing date, and still lets it in', () => {
    const parsed = readImportFile(csv(['Thornbury Open,29/05/2027,Fernwhistle Rowan,,,,05/01/2023,Limit,']))
    const row = buildImportPreview(parsed, known, { mapping: proposeMapping(parsed.headers) }).rows[0]!
    expect(row.problems.map(p => [p.severity, p.field])).toEqual([['warning', 'entriesClose']])
    expect(row.plan?.newEntry).toBeTruthy()
  })

  it('leaves out chosen rows and makes a later row build the dog itself', () => {
    const parsed = readImportFile(csv([
      'Ash Vale,29/05/2027,Fernwhistle Tansy,QX9,Ashgrove Wire Terrier,bitch,01/02/2024,Open,',
      'Ash Vale,29/05/2027,Fernwhistle Tansy,QX9,Ashgrove Wire Terrier,bitch,01/02/2024,Limit,',
    ]))
    const p = buildImportPreview(parsed, empty, { mapping: proposeMapping(parsed.headers), exclude: [2] })
    expect(p.rows.map(r => [r.excluded, Boolean(r.plan?.newDog)])).toEqual([[true, true], [false, true]])
    expect(p.counts).toMatchObject({ chosen: 1, excluded: 1, newDogs: 1, newEntries: 1 })
  })

  it('applies a fix typed in the preview', () => {
    const parsed = readImportFile(read('bad/unknown-class.csv'))
    const p = buildImportPreview(parsed, empty, { mapping: proposeMapping(parsed.headers), fixes: [{ row: 2, field: 'classCode', value: 'Limit' }] })
    expect(p.rows[0]!.problems).toEqual([])
    expect(p.rows[0]!.plan?.newEntry?.classCode).toBe('kc:limit')
  })
})

describe('eligibility warnings', () => {
  // The Kennel Club (UK) Definitions of Classes (from memory): Junior "not exceeding eighteen
  // calendar months of age on the first day of the Show"; Puppy six to twelve months.
  const junior = CLASS_DEFINITIONS.KC.find(c => c.code === 'kc:junior')!
  it.each([
    ['2026-06-01', 'young', 'kc:yearling'],
    ['2025-11-28', 'old', 'kc:minor-puppy'],
    ['2025-11-28', 'old', 'kc:junior'],
  ])('born %s, the dog is too %s for %s on 2027-05-29', (born, word, code) => {
    const text = `Show,First day,Registered name,Breed,Sex,Date of birth,Class\r\nAsh Vale,2027-05-29,Fernwhistle Pip,Ashgrove Wire Terrier,dog,${born},${code}\r\n`
    const { preview: p } = preview(new TextEncoder().encode(text))
    const warning = p.rows[0]!.problems.find(x => x.severity === 'warning' && x.field === 'classCode')!
    expect(warning.message).toContain(`too ${word}`)
    expect(warning.message).toContain(ruleSetEdition('KC'))
  })

  it('gives no warning to a dog exactly 18 months old on the first day (not exceeding eighteen)', () => {
    expect(junior.maxMonths).toBe(18)
    const text = 'Show,First day,Registered name,Breed,Sex,Date of birth,Class\r\nAsh Vale,2027-05-29,Fernwhistle Pip,Ashgrove Wire Terrier,dog,2025-11-29,Junior\r\n'
    expect(preview(new TextEncoder().encode(text)).preview.rows[0]!.problems).toEqual([])
  })
})

describe('the left-out report', () => {
  it('neutralises formula cells as shared/csv.ts neutraliseCell does (OWASP ASVS 5.0 V1.2.10, CWE-1236)', () => {
    const { parsed, preview: p } = preview(read('bad/formula-cells.csv'))
    const text = leftOutCsv(parsed.headers, leftOutRows(parsed, p.rows))
    const again = readImportFile(new TextEncoder().encode(text))
    const cells = again.rows.map(r => parsed.headers.map(h => r.cells[again.headers.indexOf(h)]))
    expect(cells).toEqual(parsed.rows.map(r => r.cells.map(c => String(neutraliseCell(c)))))
    expect(cells.flat().filter(c => c!.startsWith("'")).length).toBe(4)
    expect(again.headers.at(-1)).toBe('Reasons')
  })
})
