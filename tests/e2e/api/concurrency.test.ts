import { describe, expect, it } from 'vitest'
import { signedIn } from '../helpers/http'
import { call, logWork, makeDog } from '../helpers/kennelApi'

// More parallel requests than the connection pool holds (BLOOMLINE_DB_POOL, 10 by default). Each
// opens a transaction; any query inside it must use that transaction's own connection, or the
// requests wait on each other for a second connection until the pool gives up (30 s) with a 500.
const PARALLEL = 25

describe('many writes at once', () => {
  it('parallel edits of coat work all succeed, and the last one stands', async () => {
    const manager = await signedIn('manager')
    const dog = await makeDog(manager)
    const work = await logWork(manager, dog.id, -3, 'layer', ['neck', 'rear'])
    const answers = await Promise.all(Array.from({ length: PARALLEL }, (_, i) =>
      call(manager, `/api/work/${work.id}`, 'PATCH', { notes: `pass ${i}`, regions: ['neck', 'rear'] })))
    expect(answers.map(a => a.status)).toEqual(Array(PARALLEL).fill(200))
    const after = await call<{ notes: string }[]>(manager, `/api/dogs/${dog.id}/work`)
    expect(after.body[0]!.notes).toMatch(/^pass \d+$/)
  })
})
