import { describe, expect, it } from 'vitest'
import { buildImportPreview, proposeMapping, readImportFile, startImportPreview, type ImportContext } from '../../../../shared/import'

const context: ImportContext = { ruleSet: 'KC', today: '2026-12-01', now: new Date('2026-12-01T12:00:00Z'), dogs: [], shows: [], entries: [], members: [] }

// Ten dogs at two shows, the second show's rows after the first's, plus a repeat of row 2 at the
// end: a part that reads the second show names dogs an earlier part made, and the last row
// repeats an entry of the first part.
const lines = ['Show,First day,Registered name,Registration number,Breed,Sex,Date of birth,Class']
for (const show of ['Ash Vale Open', 'Briar Hill Open']) {
  for (let i = 1; i <= 10; i++) lines.push(`${show},${show === 'Ash Vale Open' ? '2027-05-29' : '2027-06-05'},Fernwhistle Dog ${i},FW-${i},Ashgrove Wire Terrier,dog,2024-03-0${1 + (i % 9)},Open`)
}
lines.push(lines[1]!)
const parsed = readImportFile(new TextEncoder().encode(lines.join('\r\n')))
const choices = { mapping: proposeMapping(parsed.headers), exclude: [5] }

describe('a preview read in parts', () => {
  it.each([1, 3, 7, 100])('gives the rows and counts of the whole preview, %i rows at a time', (size) => {
    const whole = buildImportPreview(parsed, context, choices)
    const run = startImportPreview(parsed, context, choices)
    const parts = []
    for (let part = run.next(size); part.length; part = run.next(size)) parts.push(part)
    expect(parts.flat()).toEqual(whole.rows)
    expect(parts.every(p => p.length <= size)).toBe(true)
    expect(run.finish()).toEqual(whole)
  })

  it('reads later rows against what earlier parts made', () => {
    const run = startImportPreview(parsed, context, choices)
    run.next(10)
    const second = run.next(10)
    // Row 12 is Fernwhistle Dog 1 again, at the second show: the dog row 2 made, not a new one.
    expect(second[0]!.actions).toEqual(['new dog', 'new show', 'new entry'])
    expect(second[0]!.plan!.newDog).toBeUndefined()
    expect(second[0]!.plan!.dog).toEqual({ key: 'dog:n:fw-1' })
    // Row 5 was left out, so its dog is made by its next row, row 15, in the later part.
    expect(second[3]!.plan!.newDog?.registrationNumber).toBe('FW-4')
    const [last] = run.next(10)
    expect(last!.problems.map(p => p.message)).toEqual([expect.stringContaining('Row 22 repeats row 2')])
    expect(run.next(10)).toEqual([])
  })
})
