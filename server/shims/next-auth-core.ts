import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'

// @sidebase/nuxt-auth imports `next-auth/core`, which next-auth 4.23+ no longer exports
// (sidebase/nuxt-auth #514, #1095). Load the same file through next-auth's own folder instead.
const require = createRequire(import.meta.url)
const nextAuthRoot = dirname(dirname(require.resolve('next-auth/jwt')))
const core = require(join(nextAuthRoot, 'core', 'index.js'))

export const AuthHandler = core.AuthHandler
export default core
