import * as m0001 from './0001-foundation'
import * as m0002 from './0002-kennel'
import * as m0003 from './0003-imports'
import * as m0004 from './0004-calendar-feeds'
import * as m0005 from './0005-mail'

/** Every migration in order. A static list, not a glob, so Nitro can bundle them. */
export const migrations = [
  { name: '0001-foundation', ...m0001 },
  { name: '0002-kennel', ...m0002 },
  { name: '0003-imports', ...m0003 },
  { name: '0004-calendar-feeds', ...m0004 },
  { name: '0005-mail', ...m0005 },
]
