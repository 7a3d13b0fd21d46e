import * as m0001 from './0001-foundation'
import * as m0002 from './0002-kennel'

/** Every migration in order. A static list, not a glob, so Nitro can bundle them. */
export const migrations = [
  { name: '0001-foundation', ...m0001 },
  { name: '0002-kennel', ...m0002 },
]
