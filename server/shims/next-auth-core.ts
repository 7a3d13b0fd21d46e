import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'

// @sidebase/nuxt-auth imports `next-auth/core`, which next-auth 4.23+ no longer exports
// (sidebase/nuxt-auth #514, #1095). Load the same file through next-auth's own folder instead.
type Core = { AuthHandler: (params: unknown) => Promise<unknown> }
let core: Core | undefined

function loadCore(): Core {
  // Resolved on first use, not at import: in Nitro's bundle `import.meta.url` only points at the
  // real server entry once that entry has run, and before that it is a placeholder.
  if (!core) {
    const require = createRequire(import.meta.url)
    const nextAuthRoot = dirname(dirname(require.resolve('next-auth/jwt')))
    core = require(join(nextAuthRoot, 'core', 'index.js')) as Core
  }
  return core
}

/** next-auth's own request handler. */
export function AuthHandler(params: unknown) {
  return loadCore().AuthHandler(params)
}

export default { AuthHandler }
