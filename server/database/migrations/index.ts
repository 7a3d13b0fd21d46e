import * as m0001 from './0001-foundation'

/** Every migration in order. A static list, not a glob, so Nitro can bundle them. */
export const migrations = [
  { name: '0001-foundation', ...m0001 },
]
