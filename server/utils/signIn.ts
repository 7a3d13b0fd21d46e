import bcrypt from 'bcryptjs'
import { Op } from 'sequelize'
import { normaliseEmail, SIGN_IN_MAX_FAILURES, SIGN_IN_WINDOW_MINUTES } from '../../shared/auth'

// Compared against when the e-mail is unknown, so a wrong e-mail costs the same time as a wrong
// password (OWASP Authentication Cheat Sheet, "Authentication Responses").
const UNKNOWN_USER_HASH = bcrypt.hashSync('no account has this password', 10)

/** The moment the e-mail's sign-in lock lifts, or null when it may sign in. */
export async function signInLockedUntil(email: string): Promise<Date | null> {
  const { SignInLock } = useModels()
  const lock = await SignInLock.findOne({ where: { email: normaliseEmail(email), lockedUntil: { [Op.gt]: new Date() } } })
  return lock?.lockedUntil ?? null
}

/**
 * The user and the organisation they start in, or null for a wrong e-mail or password. The try is
 * counted before the password is compared, so guesses sent in parallel cannot slip past the limit:
 * once SIGN_IN_MAX_FAILURES tries are on record within the window, no further password is compared.
 */
export async function checkCredentials(emailInput: string, password: string) {
  const { User, Membership, SignInFailure, SignInLock, sequelize } = useModels()
  const email = normaliseEmail(emailInput)
  if (await signInLockedUntil(email)) return null
  const attempt = await SignInFailure.create({ email })
  const since = new Date(Date.now() - SIGN_IN_WINDOW_MINUTES * 60_000)
  const tries = await SignInFailure.count({ where: { email, createdAt: { [Op.gt]: since } } })
  const lock = async () => {
    await SignInLock.upsert({ email, lockedUntil: new Date(Date.now() + SIGN_IN_WINDOW_MINUTES * 60_000) })
    await SignInFailure.destroy({ where: { email } })
  }
  if (tries > SIGN_IN_MAX_FAILURES) {
    await lock()
    return null
  }
  const user = await User.findOne({ where: sequelize.where(sequelize.fn('lower', sequelize.col('email')), email) })
  const matches = await bcrypt.compare(password, user?.passwordHash ?? UNKNOWN_USER_HASH)
  if (!user || !matches) {
    if (tries >= SIGN_IN_MAX_FAILURES) await lock()
    return null
  }
  await attempt.destroy()
  await SignInFailure.destroy({ where: { email } })
  const memberships = await Membership.findAll({ where: { userId: user.id }, order: [['createdAt', 'ASC']] })
  const remembered = memberships.find(m => m.organisationId === user.lastOrganisationId)
  const organisationId = remembered?.organisationId ?? (memberships.length === 1 ? memberships[0]!.organisationId : null)
  return { user, organisationId }
}
