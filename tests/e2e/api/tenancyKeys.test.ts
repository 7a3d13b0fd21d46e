import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { DogView, ShowView } from '../../../shared/types/kennel'
import { call, database, kennelPeople, makeDog, makeShow, today, type KennelPeople } from '../helpers/kennelApi'

// Migration 0006: the database itself refuses a row of one organisation that names another
// organisation's dog or show, whatever the API does. PostgreSQL 15 documentation, §5.4.5
// "Foreign Keys": a multi-column foreign key is checked on all its columns together, and
// violating it is SQLSTATE 23503 (Appendix A, foreign_key_violation).
const db = database()
let p: KennelPeople
let dog: DogView
let show: ShowView
let foreignDog: DogView
let foreignShow: ShowView

beforeAll(async () => {
  await db.connect()
  p = await kennelPeople()
  dog = await makeDog(p.manager)
  show = await makeShow(p.manager, 60)
  foreignDog = await makeDog(p.foreign)
  foreignShow = await makeShow(p.foreign, 60)
})
afterAll(async () => {
  for (const [jar, id] of [[p.manager, dog.id], [p.foreign, foreignDog.id]] as const) await call(jar, `/api/dogs/${id}`, 'DELETE')
  await db.end()
})

/** Runs `sql` in a transaction that is always rolled back; the error PostgreSQL gave, if any. */
async function attempt(sql: string, values: unknown[]): Promise<{ code?: string, constraint?: string } | null> {
  await db.query('BEGIN')
  try {
    await db.query(sql, values)
    return null
  }
  catch (error) {
    return error as { code?: string, constraint?: string }
  }
  finally {
    await db.query('ROLLBACK')
  }
}

const entry = (organisationId: number, dogId: number, showId: number) => attempt(
  `INSERT INTO entries (organisation_id, dog_id, show_id, class_code, created_at, updated_at) VALUES ($1, $2, $3, 'kc:open', now(), now())`, [organisationId, dogId, showId])
const work = (organisationId: number, dogId: number) => attempt(
  `INSERT INTO coat_work (organisation_id, dog_id, date, kind, regions, created_at, updated_at) VALUES ($1, $2, $3, 'strip', ARRAY['neck'], now(), now())`, [organisationId, dogId, today()])
const task = (organisationId: number, dogId: number) => attempt(
  `INSERT INTO tasks (organisation_id, dog_id, kind, regions, due_date, status, created_at, updated_at) VALUES ($1, $2, 'layer', ARRAY['neck'], $3, 'open', now(), now())`, [organisationId, dogId, today()])

describe('rows that name a dog or show must share its organisation', () => {
  it('an entry of the dog\'s and show\'s own organisation is taken', async () => {
    expect(await entry(p.organisationId, dog.id, show.id)).toBeNull()
    expect(await work(p.organisationId, dog.id)).toBeNull()
    expect(await task(p.organisationId, dog.id)).toBeNull()
  })

  it('an entry naming another organisation\'s dog, or show, is refused by the database', async () => {
    expect(await entry(p.organisationId, foreignDog.id, show.id)).toMatchObject({ code: '23503', constraint: 'entries_dog_id_same_organisation_fkey' })
    expect(await entry(p.organisationId, dog.id, foreignShow.id)).toMatchObject({ code: '23503', constraint: 'entries_show_id_same_organisation_fkey' })
    // Both named rightly but under a third organisation id: refused too, by the dog's key first or the show's.
    expect((await entry(p.foreignOrganisationId, dog.id, show.id))?.code).toBe('23503')
  })

  it('coat work and tasks naming another organisation\'s dog are refused', async () => {
    expect(await work(p.organisationId, foreignDog.id)).toMatchObject({ code: '23503', constraint: 'coat_work_dog_id_same_organisation_fkey' })
    expect(await task(p.organisationId, foreignDog.id)).toMatchObject({ code: '23503', constraint: 'tasks_dog_id_same_organisation_fkey' })
  })

  it('deleting a dog still takes its entries, coat work and tasks with it (ON DELETE CASCADE on the new keys)', async () => {
    await db.query('BEGIN')
    try {
      await db.query(`INSERT INTO entries (organisation_id, dog_id, show_id, class_code, created_at, updated_at) VALUES ($1, $2, $3, 'kc:open', now(), now())`, [p.organisationId, dog.id, show.id])
      await db.query(`INSERT INTO coat_work (organisation_id, dog_id, date, kind, regions, created_at, updated_at) VALUES ($1, $2, $3, 'strip', ARRAY['neck'], now(), now())`, [p.organisationId, dog.id, today()])
      await db.query(`INSERT INTO tasks (organisation_id, dog_id, kind, regions, due_date, status, created_at, updated_at) VALUES ($1, $2, 'layer', ARRAY['neck'], $3, 'open', now(), now())`, [p.organisationId, dog.id, today()])
      const count = async () => Number((await db.query(`SELECT (SELECT count(*) FROM entries WHERE dog_id = $1) + (SELECT count(*) FROM coat_work WHERE dog_id = $1) + (SELECT count(*) FROM tasks WHERE dog_id = $1) AS n`, [dog.id])).rows[0].n)
      expect(await count()).toBe(3)
      await db.query('DELETE FROM dogs WHERE id = $1', [dog.id])
      expect(await count()).toBe(0)
    }
    finally {
      await db.query('ROLLBACK')
    }
  })
})
