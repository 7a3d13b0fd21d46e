import { readdirSync, readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import type pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { toCsv } from '../../../shared/csv'
import type { ImportCommitView, ImportHistoryView, ImportPreviewView } from '../../../shared/import'
import type { EntryView } from '../../../shared/types/kennel'
import { request } from '../helpers/http'
import { addDays } from '../../../shared/coat'
import { call, database, inDays, kennelPeople, makeDog, makeShow, ok, TAG, type KennelPeople } from '../helpers/kennelApi'

const corpus = fileURLToPath(new URL('../../fixtures/csv/', import.meta.url))
const body = (fileName: string, text: string | Uint8Array, extra: Record<string, unknown> = {}) => ({
  fileName,
  contentBase64: Buffer.from(text).toString('base64'),
  ...extra,
})

let people: KennelPeople
let db: pg.Client
let serial = 0

/** An entry list with this run's invented names: `rows` dogs, each entered in Open at one new show. */
function entryList(rows: number, extra = '') {
  serial++
  const lines = ['Show,First day,Registered name,Registration number,Breed,Sex,Date of birth,Class,Armband']
  for (let i = 1; i <= rows; i++) lines.push(`${TAG} Import Show ${serial},${inDays(90)},Fernwhistle ${TAG} ${serial}-${i},${TAG}-${serial}-${i},Ashgrove Wire Terrier,${i % 2 ? 'dog' : 'bitch'},${addDays(inDays(0), -900)},Open,${i}`)
  return lines.join('\r\n') + extra
}

/** How many dogs, shows and entries the organisation has, to see that a refused import wrote nothing. */
async function tally() {
  const { rows } = await db.query(`SELECT
    (SELECT count(*) FROM dogs WHERE organisation_id = $1) AS dogs,
    (SELECT count(*) FROM shows WHERE organisation_id = $1) AS shows,
    (SELECT count(*) FROM entries WHERE organisation_id = $1) AS entries,
    (SELECT count(*) FROM imports WHERE organisation_id = $1) AS imports`, [people.organisationId])
  return rows[0] as Record<string, string>
}

beforeAll(async () => {
  people = await kennelPeople()
  db = database()
  await db.connect()
})
afterAll(async () => {
  await db.end()
})

describe('who may import', () => {
  it.each([
    ['POST', '/api/imports'],
    ['POST', '/api/imports/commit'],
    ['GET', '/api/imports'],
    ['GET', '/api/imports/mapping'],
    ['PUT', '/api/imports/mapping'],
  ])('%s %s is 403 for handlers and assistants', async (method, path) => {
    for (const jar of [people.handler, people.assistant]) {
      const res = await call(jar, path, method, method === 'GET' ? undefined : { ...body('x.csv', entryList(1)), commit: true, mapping: {} })
      expect(res.status).toBe(403)
    }
  })
})

describe('preview and commit', () => {
  it('previews without writing, then commits every row in one go, recorded in the history', async () => {
    const text = entryList(3)
    const before = await tally()
    const preview = await ok<ImportPreviewView>(people.manager, '/api/imports', 'POST', body('spring.csv', text), 200)
    expect(preview.mapping).toMatchObject({ showName: 'Show', registeredName: 'Registered name', classCode: 'Class' })
    expect(preview.counts).toMatchObject({ rows: 3, newDogs: 3, newShows: 1, newEntries: 3, withErrors: 0 })
    expect(preview.rows[0]!.actions).toEqual(['new dog', 'new show', 'new entry'])
    expect(await tally()).toEqual(before)

    const done = await ok<ImportCommitView>(people.manager, '/api/imports/commit', 'POST', { ...body('spring.csv', text), commit: true })
    expect(done.counts.newEntries).toBe(3)
    const after = await tally()
    expect(Number(after.entries) - Number(before.entries)).toBe(3)
    expect(Number(after.dogs) - Number(before.dogs)).toBe(3)
    // The answer names what it made by id, and leaves out the rows that went in cleanly.
    expect(done.rows).toEqual([])
    expect(done.dogs.map(d => [d.callName, d.created])).toEqual([1, 2, 3].map(i => [`Fernwhistle ${TAG} ${serial}-${i}`, true]))
    expect(done.shows).toEqual([{ id: expect.any(Number), name: `${TAG} Import Show ${serial}`, firstDay: inDays(90), created: true }])
    const made = await db.query('SELECT id, dog_id, show_id FROM entries WHERE organisation_id = $1 AND id = ANY($2) ORDER BY id', [people.organisationId, done.entries.created])
    expect(made.rows.map(r => r.id)).toEqual(done.entries.created)
    expect(new Set(made.rows.map(r => r.dog_id))).toEqual(new Set(done.dogs.map(d => d.id)))
    expect(made.rows.every(r => r.show_id === done.shows[0]!.id)).toBe(true)

    const history = await ok<ImportHistoryView[]>(people.manager, '/api/imports', 'GET')
    expect(history[0]).toMatchObject({ id: done.importId, fileName: 'spring.csv', user: { id: people.ids.manager }, leftOut: 0 })
    expect(history[0]!.mapping).toEqual(done.mapping)

    // Re-importing the same file changes nothing: every row is unchanged, and names the same dogs, show and entries.
    const again = await ok<ImportCommitView>(people.manager, '/api/imports/commit', 'POST', { ...body('spring.csv', text), commit: true })
    expect(again.counts).toMatchObject({ matchedDogs: 3, matchedShows: 1, unchanged: 3, newDogs: 0, newShows: 0, newEntries: 0, updated: 0 })
    expect(again.entries).toEqual({ created: [], updated: [], unchanged: done.entries.created })
    expect(again.dogs).toEqual(done.dogs.map(d => ({ ...d, created: false })))
    expect(again.shows).toEqual(done.shows.map(s => ({ ...s, created: false })))
    expect(again.rows).toEqual([])
    const third = await tally()
    expect({ ...third, imports: '' }).toEqual({ ...after, imports: '' })
  })

  it('writes nothing when a chosen row still has an error, even when the request skipped the preview', async () => {
    const text = entryList(2, `\r\n${TAG} Crafted,31/02/2027,Fernwhistle ${TAG} crafted,,Ashgrove Wire Terrier,dog,2024-01-01,Wizard,1`)
    const before = await tally()
    const res = await call(people.manager, '/api/imports/commit', 'POST', { ...body('crafted.csv', text), commit: true })
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(/Row 4 still has problems/)
    expect(res.body.data.rows[0].problems.map((p: { field: string }) => p.field)).toEqual(['showFirstDay', 'classCode'])
    expect(await tally()).toEqual(before)

    // Left out, the other rows go in, and the left-out report says why, as CSV.
    const done = await ok<ImportCommitView>(people.manager, '/api/imports/commit', 'POST', { ...body('crafted.csv', text), commit: true, exclude: [4] })
    expect(done.counts).toMatchObject({ chosen: 2, excluded: 1, newEntries: 2 })
    // Only the left-out row comes back, with the problems that kept it out.
    expect(done.rows.map(r => [r.row, r.excluded, r.problems.map(p => p.field)])).toEqual([[4, true, ['showFirstDay', 'classCode']]])
    expect(done.entries.created).toHaveLength(2)
    const report = await request(people.manager, `/api/imports/${done.importId}/left-out`)
    expect(report.headers.get('content-type')).toMatch(/text\/csv/)
    const bytes = new Uint8Array(await report.arrayBuffer())
    // A UTF-8 byte-order mark (EF BB BF, RFC 3629 §6), so spreadsheets read the accents right.
    expect([...bytes.slice(0, 3)]).toEqual([0xEF, 0xBB, 0xBF])
    const csv = new TextDecoder().decode(bytes)
    expect(csv).toMatch(/^Row,Show,/)
    // RFC 4180 §2.7: the quotes of the reason are doubled inside the quoted cell.
    expect(csv).toContain('""31/02/2027"" is not a date')
  })

  it('rolls everything back when the database fails half-way', async () => {
    // The injected failure: a trigger that refuses one entry, after the dogs and the show are written.
    await db.query(`CREATE OR REPLACE FUNCTION bloomline_test_fail() RETURNS trigger AS $$
      BEGIN IF NEW.armband = 'FAIL-HALFWAY' THEN RAISE EXCEPTION 'injected failure'; END IF; RETURN NEW; END $$ LANGUAGE plpgsql`)
    await db.query('CREATE TRIGGER bloomline_test_fail BEFORE INSERT ON entries FOR EACH ROW EXECUTE FUNCTION bloomline_test_fail()')
    try {
      const text = entryList(4).replace(/,2\r\n/, ',FAIL-HALFWAY\r\n')
      expect(text).toContain('FAIL-HALFWAY')
      const before = await tally()
      const res = await call(people.manager, '/api/imports/commit', 'POST', { ...body('failing.csv', text), commit: true })
      expect(res.status).toBe(500)
      expect(res.body.message).toMatch(/nothing was imported/)
      expect(await tally()).toEqual(before)
    }
    finally {
      await db.query('DROP TRIGGER bloomline_test_fail ON entries')
      await db.query('DROP FUNCTION bloomline_test_fail()')
    }
  })

  it('imports an exported entry list back with no changes', async () => {
    const show = await makeShow(people.manager, 60)
    const dogs = await Promise.all([makeDog(people.manager, { registrationNumber: `${TAG}-RT1` }), makeDog(people.manager)])
    for (const [i, dog] of dogs.entries()) await ok(people.manager, '/api/entries', 'POST', { dogId: dog.id, showId: show.id, classCode: i ? 'kc:limit' : 'kc:open', armband: `${i + 20}` })
    const entries = await ok<EntryView[]>(people.manager, `/api/entries?show=${show.id}`, 'GET')
    const regNo = new Map(dogs.map(d => [d.id, d.registrationNumber]))
    const exported = toCsv(entries, [
      { header: 'Show', value: e => e.show.name },
      { header: 'First day', value: e => e.show.firstDay },
      { header: 'Registered name', value: e => e.dog.registeredName },
      { header: 'Registration number', value: e => regNo.get(e.dog.id) },
      { header: 'Date of birth', value: e => e.dog.dateOfBirth },
      { header: 'Class', value: e => e.classLabel },
      { header: 'Armband', value: e => e.armband },
    ], { bom: true })
    const before = await tally()
    const done = await ok<ImportCommitView>(people.manager, '/api/imports/commit', 'POST', { ...body('export.csv', exported), commit: true })
    expect(done.counts).toMatchObject({ matchedDogs: 2, matchedShows: 1, unchanged: 2, newDogs: 0, newShows: 0, newEntries: 0, updated: 0, withWarnings: 0 })
    expect(done.entries).toEqual({ created: [], updated: [], unchanged: entries.map(e => e.id).sort((a, b) => a - b) })
    expect(done.rows).toEqual([])
    expect({ ...(await tally()), imports: '' }).toEqual({ ...before, imports: '' })
  })

  it('answers a commit with the rows that have a warning, and changes an armband in place', async () => {
    const text = entryList(2)
    const first = await ok<ImportCommitView>(people.manager, '/api/imports/commit', 'POST', { ...body('warn.csv', text), commit: true })
    // Row 3 again with armband 9 and, in a new row, the same dog in Puppy: born 900 days before
    // today, it is far past the KC's twelve months (Definitions of Classes, from memory; DESIGN.md §5).
    const lines = text.split('\r\n')
    const changed = [...lines, lines[2]!.replace(/,Open,2$/, ',Puppy,')].map((line, i) => i === 2 ? line.replace(/,2$/, ',9') : line).join('\r\n')
    const done = await ok<ImportCommitView>(people.manager, '/api/imports/commit', 'POST', { ...body('warn.csv', changed), commit: true })
    expect(done.counts).toMatchObject({ unchanged: 1, updated: 1, newEntries: 1, withWarnings: 1 })
    expect(done.rows.map(r => [r.row, r.actions, r.problems.map(p => [p.severity, p.field])])).toEqual([[4, ['matched dog', 'matched show', 'new entry'], [['warning', 'classCode']]]])
    expect(done.rows[0]!.problems[0]!.message).toContain('too old for Puppy')
    expect(done.entries.updated).toHaveLength(1)
    expect(first.entries.created).toContain(done.entries.updated[0])
    const { rows } = await db.query('SELECT armband FROM entries WHERE id = $1', [done.entries.updated[0]])
    expect(rows[0].armband).toBe('9')
  })

  it('stores quotes, backslashes, commas and braces in names exactly as the file has them', async () => {
    // RFC 4180 §2.7: a double quote inside a quoted field is written twice. The names carry the
    // characters PostgreSQL's array text treats specially (quote, backslash, comma, braces, NULL).
    const show = `${TAG} "Spring" Open \\ {North}`
    const dog = `Fernwhistle ${TAG} "Bramble", NULL`
    const text = `Show,First day,Registered name,Breed,Sex,Date of birth,Class\r\n"${show.replace(/"/g, '""')}",${inDays(80)},"${dog.replace(/"/g, '""')}",Ashgrove Wire Terrier,dog,${addDays(inDays(0), -900)},Open\r\n`
    const done = await ok<ImportCommitView>(people.manager, '/api/imports/commit', 'POST', { ...body('quotes.csv', text), commit: true })
    expect(done.counts).toMatchObject({ newDogs: 1, newShows: 1, newEntries: 1 })
    const stored = await db.query('SELECT s.name AS show, d.registered_name AS dog, d.call_name AS call FROM entries e JOIN shows s ON s.id = e.show_id JOIN dogs d ON d.id = e.dog_id WHERE e.id = $1', [done.entries.created[0]])
    expect(stored.rows[0]).toEqual({ show, dog, call: dog })
    expect(done.shows[0]!.name).toBe(show)
  })

  it('writes a file of thousands of rows in parts, a dog made early entered again late, all in one transaction', async () => {
    // 3,100 dogs at one show, then the same dogs at a second: the server writes 2,500 rows at a
    // time (server/utils/imports.ts), so later parts name dogs that earlier parts made.
    serial++
    const dogs = 3_100
    const line = (show: number, i: number) => `${TAG} Long Show ${serial}-${show},${inDays(100 + show)},Fernwhistle ${TAG} L${serial}-${i},${TAG}-L${serial}-${i},Ashgrove Wire Terrier,${i % 2 ? 'dog' : 'bitch'},${addDays(inDays(0), -900)},Open,${i}`
    const lines = ['Show,First day,Registered name,Registration number,Breed,Sex,Date of birth,Class,Armband']
    for (const show of [1, 2]) for (let i = 1; i <= dogs; i++) lines.push(line(show, i))
    const text = lines.join('\r\n')
    const before = await tally()

    // A bad row at the very end, after parts have been written: still nothing is kept.
    const refused = await call(people.manager, '/api/imports/commit', 'POST', { ...body('long.csv', `${text}\r\n${TAG} Long Show,31/02/2027,Fernwhistle ${TAG} late,,Ashgrove Wire Terrier,dog,2024-01-01,Open,1`), commit: true })
    expect(refused.status).toBe(400)
    expect(refused.body.message).toMatch(new RegExp(`Row ${2 * dogs + 2} still has problems`))
    expect(await tally()).toEqual(before)

    const done = await ok<ImportCommitView>(people.manager, '/api/imports/commit', 'POST', { ...body('long.csv', text), commit: true })
    expect(done.counts).toMatchObject({ rows: 2 * dogs, newDogs: dogs, newShows: 2, newEntries: 2 * dogs, withErrors: 0 })
    expect(done.entries.created).toHaveLength(2 * dogs)
    expect(done.dogs.filter(d => d.created)).toHaveLength(dogs)
    const after = await tally()
    expect(Number(after.entries) - Number(before.entries)).toBe(2 * dogs)
    expect(Number(after.dogs) - Number(before.dogs)).toBe(dogs)
    // Every dog is in both shows, under the one dog row: none was made twice across the parts.
    const { rows } = await db.query(`SELECT d.registration_number, count(*)::int AS n, count(DISTINCT e.show_id)::int AS shows FROM entries e JOIN dogs d ON d.id = e.dog_id
      WHERE e.id = ANY($1) GROUP BY d.registration_number`, [done.entries.created])
    expect(rows).toHaveLength(dogs)
    expect(rows.every(r => r.n === 2 && r.shows === 2)).toBe(true)
    const last = await db.query('SELECT e.armband FROM entries e JOIN dogs d ON d.id = e.dog_id WHERE d.organisation_id = $1 AND d.registration_number = $2', [people.organisationId, `${TAG}-L${serial}-${dogs}`])
    expect(last.rows).toEqual([{ armband: String(dogs) }, { armband: String(dogs) }])
    // 3,100 more dogs would weigh on every page the later files open (the home page lists each dog):
    // take them out again; their entries go with them (ON DELETE CASCADE).
    await db.query('DELETE FROM dogs WHERE id = ANY($1)', [done.dogs.filter(d => d.created).map(d => d.id)])
    await db.query('DELETE FROM shows WHERE id = ANY($1)', [done.shows.filter(s => s.created).map(s => s.id)])
  })

  it('remembers the mapping for the next file', async () => {
    const mapping = { registeredName: 'Hound', classCode: 'Ring class' }
    await ok(people.manager, '/api/imports/mapping', 'PUT', { mapping }, 200)
    expect(await ok(people.manager, '/api/imports/mapping', 'GET')).toEqual({ mapping })
    const preview = await ok<ImportPreviewView>(people.manager, '/api/imports', 'POST', body('next.csv', 'hound,ring class,Breed\r\nFernwhistle X,Open,Ashgrove\r\n'), 200)
    expect(preview.mapping).toEqual({ registeredName: 'hound', classCode: 'ring class', breed: 'Breed' })
  })
})

describe('the bad-file corpus over HTTP', () => {
  const files = readdirSync(`${corpus}bad`)
  it.each(files)('%s is refused or previewed with a clear message, never a 500, within a few seconds', async (file) => {
    const started = Date.now()
    const before = await tally()
    const res = await call(people.manager, '/api/imports/commit', 'POST', { ...body(file, readFileSync(`${corpus}bad/${file}`)), commit: true })
    expect(res.status, JSON.stringify(res.body)).toBe(400)
    expect(res.body.message).toMatch(/\.$/)
    expect(Date.now() - started).toBeLessThan(5000)
    expect(await tally()).toEqual(before)
  })

  it.each([
    ['10 MB and one byte', () => Buffer.alloc(10 * 1024 * 1024 + 1, 'a,b\n'), /up to 10 MB/],
    ['a million columns', () => Buffer.from(`${Array(1_000_000).fill('c').join(',')}\n1\n`), /1,000,000 columns/],
  ])('%s is refused with one sentence', async (_name, make, message) => {
    const started = Date.now()
    const res = await call(people.manager, '/api/imports', 'POST', body('big.csv', make()))
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(message)
    expect(Date.now() - started).toBeLessThan(10_000)
  })
})
