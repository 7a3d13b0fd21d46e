import CredentialsImport from 'next-auth/providers/credentials'
import { NuxtAuthHandler } from '#auth'
import { credentialsSchema } from '../../../shared/schemas/signIn'
import type { BloomlineToken } from '../../utils/auth'

// next-auth is CommonJS: its default export arrives wrapped or not depending on the bundler.
const CredentialsProvider = ((CredentialsImport as unknown as { default?: typeof CredentialsImport }).default ?? CredentialsImport)

const authHandler = NuxtAuthHandler({
  secret: useRuntimeConfig().authSecret,
  session: { strategy: 'jwt', maxAge: 14 * 24 * 60 * 60 },
  pages: { signIn: '/signin', error: '/signin' },
  logger: {
    error: (code, metadata) => console.warn(`[auth] ${code}`, (metadata as Error)?.message ?? ''),
    warn: () => {},
    debug: () => {},
  },
  providers: [
    CredentialsProvider({
      name: 'E-mail and password',
      credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
      async authorize(credentials) {
        const parsed = credentialsSchema.safeParse(credentials)
        if (!parsed.success) return null
        const found = await checkCredentials(parsed.data.email, parsed.data.password)
        if (!found) return null
        return {
          id: String(found.user.id),
          name: found.user.name,
          email: found.user.email,
          organisationId: found.organisationId,
          sessionVersion: found.user.sessionVersion,
        }
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user, trigger, session }) {
      const t = token as typeof token & BloomlineToken
      if (user) {
        const u = user as typeof user & { organisationId: number | null, sessionVersion: number }
        t.userId = Number(u.id)
        t.organisationId = u.organisationId
        t.sessionVersion = u.sessionVersion
      }
      if (trigger === 'update' && t.userId) {
        const wanted = Number((session as { organisationId?: unknown } | undefined)?.organisationId)
        const { Membership, User } = useModels()
        const membership = Number.isInteger(wanted) ? await Membership.findOne({ where: { userId: t.userId, organisationId: wanted } }) : null
        if (membership) {
          t.organisationId = wanted
          await User.update({ lastOrganisationId: wanted }, { where: { id: t.userId } })
        }
      }
      return t
    },
    async session({ session, token }) {
      const t = token as typeof token & BloomlineToken
      const me = t.userId ? await describeSession(t) : null
      if (!me) throw new Error('session no longer valid')
      return { ...session, ...me }
    },
  },
})

/** The sign-in endpoints, with the lock-out check of DESIGN.md §2 before the credentials are tried. */
export default defineEventHandler(async (event) => {
  if (event.method === 'POST' && event.context.params?._ === 'callback/credentials') {
    const { email } = await readBodyWith(event, credentialsSchema)
    const lockedUntil = await signInLockedUntil(email)
    if (lockedUntil) {
      const minutes = Math.max(1, Math.ceil((lockedUntil.getTime() - Date.now()) / 60_000))
      setResponseHeader(event, 'Retry-After', minutes * 60)
      throw createError({
        statusCode: 429,
        statusMessage: 'Too Many Requests',
        message: `Too many failed sign-ins for this e-mail. Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again, or ask your manager to reset your password.`,
      })
    }
  }
  return authHandler(event)
})
