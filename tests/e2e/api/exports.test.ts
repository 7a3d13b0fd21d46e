import Papa from 'papaparse'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { addDays } from '../../../shared/coat'
import { IMPORT_FIELDS, proposeMapping, type ImportPreviewView } from '../../../shared/import'
import type { DogView, EntryView, ShowView } from '../../../shared/types/kennel'
import { request, type CookieJar } from '../helpers/http'
import { call, database, giveTask, inDays, kennelPeople, logWork, makeDog, makeShow, ok, TAG, today, type KennelPeople } from '../helpers/kennelApi'

const db = database()
let p: KennelPeople
let show: ShowView
let handlersDog: DogView
let othersDog: DogView
let plainDog: DogView
let foreignShow: ShowView
let foreignDog: DogView
let openEntry: EntryView

/** A download: status, headers, the raw bytes and the text after the byte-order mark. */
async function download(jar: CookieJar, path: string) {
  const res = await request(jar, path)
  const bytes = new Uint8Array(await res.arrayBuffer())
  const text = new TextDecoder('utf-8', { ignoreBOM: true }).decode(bytes)
  return { status: res.status, headers: res.headers, bytes, text: text.replace(/^\uFEFF/, '') }
}

/** The file read back with papaparse, as a spreadsheet user's second program would: a header row and records. */
function parse(text: string) {
  const result = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true })
  expect(result.errors).toEqual([])
  return { header: result.meta.fields ?? [], rows: result.data }
}

beforeAll(async () => {
  await db.connect()
  p = await kennelPeople()
  // Larkspur's rule set is KC (seeders/accounts.ts); every dog is an adult, so Open suits them all.
  handlersDog = await makeDog(p.manager, {
    handlerId: p.ids.handler,
    registrationNumber: `${TAG}-EX-1`,
    ownerName: 'Wrenna Halloway',
    ownerEmail: `wrenna.${TAG.toLowerCase()}@owners.example`,
    dateOfBirth: addDays(today(), -4 * 365),
  })
  othersDog = await makeDog(p.manager, { handlerId: p.ids.handler2, registrationNumber: `${TAG}-EX-2`, dateOfBirth: addDays(today(), -3 * 365) })
  // No registration number: the import matches it by registered name and date of birth.
  plainDog = await makeDog(p.manager, { dateOfBirth: addDays(today(), -5 * 365) })
  show = await makeShow(p.manager, 40, {
    club: 'Quillmoor Terrier Society, North',
    place: 'Bracken Hall, "East" ring',
    judges: ['Orla Penhallow', 'Dov Ashcombe'],
    entriesCloseDate: inDays(20),
    entriesCloseTime: '18:00',
  })
  openEntry = await ok<EntryView>(p.manager, '/api/entries', 'POST', { dogId: handlersDog.id, showId: show.id, classCode: 'kc:open', armband: '17', handlerId: p.ids.handler })
  await ok<EntryView>(p.manager, '/api/entries', 'POST', { dogId: handlersDog.id, showId: show.id, classCode: 'kc:limit' })
  await ok<EntryView>(p.manager, '/api/entries', 'POST', { dogId: othersDog.id, showId: show.id, classCode: 'kc:open', armband: '18', handlerId: p.ids.handler2 })
  await ok<EntryView>(p.manager, '/api/entries', 'POST', { dogId: plainDog.id, showId: show.id, classCode: 'kc:open' })
  await logWork(p.manager, handlersDog.id, -3, 'strip', ['neck'], { minutes: 25, notes: 'Neck rolled, "tidy" enough' })
  await logWork(p.manager, handlersDog.id, -1, 'layer', ['neck', 'rear'])
  foreignShow = await makeShow(p.foreign, 30)
  foreignDog = await makeDog(p.foreign)
})
afterAll(async () => {
  await db.end()
})

describe('the entries export', () => {
  const path = () => `/api/shows/${show.id}/entries.csv`

  it('is a CSV attachment with its charset, a file name and a UTF-8 byte-order mark', async () => {
    const res = await download(p.manager, path())
    expect(res.status).toBe(200)
    // RFC 4180 §3 registers text/csv with a charset parameter; RFC 6266 §4 the attachment disposition.
    expect(res.headers.get('content-type')).toMatch(/^text\/csv;\s*charset=utf-8$/i)
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="entries-[a-z0-9-]+-\d{4}-\d{2}-\d{2}\.csv"$/)
    // The UTF-8 byte-order mark is EF BB BF (Unicode 15, §23.8).
    expect([...res.bytes.slice(0, 3)]).toEqual([0xEF, 0xBB, 0xBF])
  })

  it('has one header per import field that the import engine maps by itself, and a row per entry', async () => {
    const { header, rows } = parse((await download(p.manager, path())).text)
    const mapping = proposeMapping(header)
    expect(Object.keys(mapping).sort()).toEqual([...IMPORT_FIELDS].sort())
    expect(header).toContain('Status')
    expect(rows).toHaveLength(4)
    const open = rows.find(r => r[mapping.registrationNumber!] === handlersDog.registrationNumber && r[mapping.classCode!] === 'Open')!
    expect(open).toMatchObject({
      [mapping.showName!]: show.name,
      [mapping.showFirstDay!]: show.firstDay,
      [mapping.club!]: 'Quillmoor Terrier Society, North',
      [mapping.place!]: 'Bracken Hall, "East" ring',
      [mapping.judge!]: 'Orla Penhallow; Dov Ashcombe',
      [mapping.entriesClose!]: inDays(20),
      [mapping.registeredName!]: handlersDog.registeredName,
      [mapping.ownerEmail!]: handlersDog.owner!.email,
      [mapping.handlerEmail!]: 'tobias@larkspur.example',
      [mapping.armband!]: '17',
      Status: openEntry.status,
    })
  })

  it('gives a handler only the entries of the dogs they see, with the owner contact the dog page gives them', async () => {
    const { header, rows } = parse((await download(p.handler, path())).text)
    const mapping = proposeMapping(header)
    expect(rows.map(r => r[mapping.registeredName!])).toEqual([handlersDog.registeredName, handlersDog.registeredName])
    expect(rows[0]![mapping.ownerEmail!]).toBe(handlersDog.owner!.email)
  })

  it('gives the other handler only their own dog\'s entry', async () => {
    const { header, rows } = parse((await download(p.handler2, path())).text)
    expect(rows.map(r => r[proposeMapping(header).registeredName!])).toEqual([othersDog.registeredName])
  })

  // DESIGN.md §2: assistants see no entries (403); another organisation's show is a 404.
  it.each([
    ['an assistant', () => p.assistant, 403],
    ['another organisation\'s manager', () => p.foreign, 404],
  ] as const)('answers %s with %s', async (_, jar, status) => {
    expect((await download(jar(), path())).status).toBe(status)
  })

  it('is a 404 for another organisation\'s show, even for a manager', async () => {
    expect((await download(p.manager, `/api/shows/${foreignShow.id}/entries.csv`)).status).toBe(404)
  })

  it('imports back through the preview with every row unchanged and no problems (the round trip)', async () => {
    const res = await download(p.manager, path())
    const { header } = parse(res.text)
    const preview = await ok<ImportPreviewView>(p.manager, '/api/imports', 'POST', {
      fileName: 'round-trip.csv',
      contentBase64: Buffer.from(res.bytes).toString('base64'),
      mapping: proposeMapping(header),
    }, 200)
    expect(preview.rows).toHaveLength(4)
    for (const row of preview.rows) {
      expect(row.problems, `row ${row.row}`).toEqual([])
      expect(row.actions, `row ${row.row}`).toEqual(['matched dog', 'matched show', 'unchanged'])
    }
    expect(preview.counts).toMatchObject({ rows: 4, unchanged: 4, newDogs: 0, newShows: 0, newEntries: 0, updated: 0, withErrors: 0, withWarnings: 0 })
  })
})

describe('the coat-work export', () => {
  const path = () => `/api/dogs/${handlersDog.id}/work.csv`

  it('lists the dog\'s work newest first with region labels, as an attachment', async () => {
    const res = await download(p.manager, path())
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toMatch(/^text\/csv;\s*charset=utf-8$/i)
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="coat-work-[a-z0-9-]+-\d{4}-\d{2}-\d{2}\.csv"$/)
    expect([...res.bytes.slice(0, 3)]).toEqual([0xEF, 0xBB, 0xBF])
    const { header, rows } = parse(res.text)
    expect(header).toEqual(['Date', 'Work', 'Regions', 'Minutes', 'Worked by', 'Logged by', 'Notes'])
    expect(rows.map(r => r.Date)).toEqual([inDays(-1), inDays(-3)])
    expect(rows[1]).toMatchObject({ Minutes: '25', Notes: 'Neck rolled, "tidy" enough' })
    // Region labels as the default coat profile names them (shared/coat/profile.ts).
    expect(rows[0]!.Regions).toBe('Neck; Rear')
    expect(rows[0]!.Work).not.toBe('')
  })

  it('leaves deleted work out', async () => {
    const work = await logWork(p.manager, handlersDog.id, -2, 'bath', ['neck']) as { id: number }
    expect(parse((await download(p.manager, path())).text).rows).toHaveLength(3)
    await ok(p.manager, `/api/work/${work.id}`, 'DELETE', undefined, 204)
    expect(parse((await download(p.manager, path())).text).rows).toHaveLength(2)
  })

  it('is open to anyone who may see the dog, and a 404 to anyone who may not', async () => {
    expect((await download(p.handler, path())).status).toBe(200)
    expect((await download(p.handler2, path())).status).toBe(404)
    expect((await download(p.assistant2, path())).status).toBe(404)
    await giveTask(db, p.organisationId, handlersDog.id, p.ids.assistant2)
    expect((await download(p.assistant2, path())).status).toBe(200)
    expect((await download(p.foreign, path())).status).toBe(404)
    expect((await download(p.manager, `/api/dogs/${foreignDog.id}/work.csv`)).status).toBe(404)
  })
})

// OWASP ASVS 5.0 V1.2.10 and CWE-1236: cells starting with = + - @ tab or CR are neutralised with
// a leading single quote. NUL is on the same list but PostgreSQL text cannot hold it, so no
// stored value can start with one. The API trims text, so the values go in through SQL.
let formulaShow: ShowView | undefined
const showForFormulas = async () => (formulaShow ??= await makeShow(p.manager, 50))

describe.each([
  ['=', '=HYPERLINK("http://evil.example","go")'],
  ['+', '+44 1632 960000'],
  ['-', '-2+3'],
  ['@', '@SUM(A1:A2)'],
  ['tab', '\tbefore a tab'],
  ['carriage return', '\rbefore a CR'],
])('a value starting with %s', (_, value) => {
  it('is neutralised in the entries export', async () => {
    const dog = await makeDog(p.manager, { dateOfBirth: addDays(today(), -3 * 365) })
    const target = await showForFormulas()
    await ok(p.manager, '/api/entries', 'POST', { dogId: dog.id, showId: target.id, classCode: 'kc:open' })
    await db.query('UPDATE dogs SET owner_name = $1 WHERE id = $2', [value, dog.id])
    const { header, rows } = parse((await download(p.manager, `/api/shows/${target.id}/entries.csv`)).text)
    const mapping = proposeMapping(header)
    const row = rows.find(r => r[mapping.registeredName!] === dog.registeredName)!
    expect(row[mapping.ownerName!]).toBe(`'${value}`)
  })

  it('is neutralised in the coat-work export', async () => {
    const dog = await makeDog(p.manager)
    const work = await logWork(p.manager, dog.id, -1, 'strip', ['neck'], { notes: 'to be replaced' }) as { id: number }
    await db.query('UPDATE coat_work SET notes = $1 WHERE id = $2', [value, work.id])
    const { rows } = parse((await download(p.manager, `/api/dogs/${dog.id}/work.csv`)).text)
    expect(rows[0]!.Notes).toBe(`'${value}`)
  })
})

it('lets no role read a show\'s entries without signing in', async () => {
  const res = await call(null, `/api/shows/${show.id}/entries.csv`)
  expect(res.status).toBe(401)
})
