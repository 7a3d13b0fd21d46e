import bcrypt from 'bcryptjs'
import { Op } from 'sequelize'
import { normaliseEmail } from '../../shared/auth'
import { passwordResetMail } from '../../shared/mail/passwordReset'
import { RESET_LINK_MINUTES, RESET_MAILS_PER_HOUR } from '../../shared/schemas/passwordReset'
import type { PasswordResetLinkStatus, PasswordResetLookupView } from '../../shared/types/invitations'
import type { PasswordReset, User } from '../database/models'
import { hashLinkToken, newLinkToken, findUserByEmail } from './invitations'
import { appUrl, cancelWaitingMail, queueMail } from './mail'

/** Where a reset link stands at `now`. */
export function passwordResetStatus(reset: Pick<PasswordReset, 'usedAt' | 'expiresAt'>, now = new Date()): PasswordResetLinkStatus {
  if (reset.usedAt) return 'used'
  if (reset.expiresAt.getTime() <= now.getTime()) return 'expired'
  return 'open'
}

/** The sentence a reset link that no longer works shows. */
export function passwordResetClosedMessage(status: PasswordResetLinkStatus): string | null {
  if (status === 'used') return 'This reset link has already been used. Sign in with your new password, or ask for a new link if you have lost it again.'
  if (status === 'expired') return 'This reset link has expired: a link works for one hour, and asking again replaces any older link. Ask for a new one.'
  return null
}

/** The 404 for a reset link whose secret matches nothing. */
export function unknownResetLink() {
  return createError({ statusCode: 404, statusMessage: 'Not Found', message: 'This reset link is not valid. Check it was copied whole, or ask for a new one.' })
}

/** The reset a link's secret opens, or null. */
export async function findResetByToken(token: string) {
  const { PasswordReset } = useModels()
  return PasswordReset.findOne({ where: { tokenHash: hashLinkToken(token) } })
}

/** What the reset page shows for a link; the address only while it works. */
export async function passwordResetLookupView(reset: PasswordReset): Promise<PasswordResetLookupView> {
  const { User } = useModels()
  const status = passwordResetStatus(reset)
  const user = status === 'open' ? await User.findByPk(reset.userId) : null
  const timeZone = user ? (await mailContext(user)).timeZone : 'UTC'
  return { status, email: user?.email ?? null, expiresAt: reset.expiresAt.toISOString(), timeZone, message: passwordResetClosedMessage(status) }
}

/** The time zone and organisation names a person's reset message is written for. */
async function mailContext(user: User) {
  const { Membership, Organisation } = useModels()
  const memberships = await Membership.findAll({ where: { userId: user.id }, include: [{ model: Organisation, as: 'organisation' }], order: [['createdAt', 'ASC']] })
  const organisations = memberships.map(m => m.organisation!).filter(Boolean)
  const home = organisations.find(o => o.id === user.lastOrganisationId) ?? organisations[0]
  return { timeZone: home?.timeZone ?? 'UTC', organisationNames: organisations.map(o => o.name) }
}

/**
 * The work behind a reset request, done after the answer has gone (see the route): for an
 * address with an account, a new one-hour link (older live links of the person stop working) and
 * its message, unless RESET_MAILS_PER_HOUR messages went to it within the hour. Unknown addresses
 * get nothing. Returns what it did, for the log.
 */
export async function issuePasswordReset(emailInput: string): Promise<'sent' | 'unknown' | 'limited'> {
  const email = normaliseEmail(emailInput)
  const user = await findUserByEmail(email)
  if (!user) return 'unknown'
  const { PasswordReset, sequelize } = useModels()
  return sequelize.transaction(async (transaction) => {
    // One request at a time per person, so parallel requests cannot slip past the hourly limit.
    await sequelize.query('SELECT pg_advisory_xact_lock(hashtext($1))', { bind: [`password-reset:${user.id}`], transaction })
    const recent = await PasswordReset.count({ where: { userId: user.id, createdAt: { [Op.gt]: new Date(Date.now() - 60 * 60_000) } }, transaction })
    if (recent >= RESET_MAILS_PER_HOUR) return 'limited' as const
    const now = new Date()
    await PasswordReset.update({ expiresAt: now }, { where: { userId: user.id, usedAt: null, expiresAt: { [Op.gt]: now } }, transaction })
    // An older link still waiting in the outbox would arrive dead: withdraw it.
    await cancelWaitingMail({ organisationId: null, kind: 'password_reset', recipientEmail: user.email })
    const { token, hash } = newLinkToken()
    const reset = await PasswordReset.create({ userId: user.id, tokenHash: hash, expiresAt: new Date(now.getTime() + RESET_LINK_MINUTES * 60_000) }, { transaction })
    const context = await mailContext(user)
    await queueMail({
      organisationId: null,
      recipientUserId: user.id,
      to: user.email,
      toName: user.name,
      kind: 'password_reset',
      periodKey: `reset-${reset.id}`,
      message: passwordResetMail({
        name: user.name,
        email: user.email,
        organisationNames: context.organisationNames,
        link: appUrl(`/password/reset/${token}`),
        expiresAt: reset.expiresAt,
        validMinutes: RESET_LINK_MINUTES,
        timeZone: context.timeZone,
      }),
    })
    return 'sent' as const
  })
}

/**
 * Sets a new password through a reset link, once: the link is used up, every other live link of
 * the person stops working, every session of theirs ends (session_version), and any sign-in
 * lock-out on the address is lifted. Returns the address to sign in with.
 */
export async function confirmPasswordReset(token: string, password: string): Promise<{ email: string }> {
  const found = await findResetByToken(token)
  if (!found) throw unknownResetLink()
  const early = passwordResetClosedMessage(passwordResetStatus(found))
  if (early) throw createError({ statusCode: 410, statusMessage: 'Gone', message: early })
  const passwordHash = await bcrypt.hash(password, 10)
  const { PasswordReset, SignInFailure, SignInLock, User, sequelize } = useModels()
  return sequelize.transaction(async (transaction) => {
    // Under a lock: two tabs using one link at once set one password, and the other is told it was used.
    const reset = await PasswordReset.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE })
    const closed = reset ? passwordResetClosedMessage(passwordResetStatus(reset)) : null
    if (!reset) throw unknownResetLink()
    if (closed) throw createError({ statusCode: 410, statusMessage: 'Gone', message: closed })
    const user = await User.findByPk(reset.userId, { transaction, lock: transaction.LOCK.UPDATE })
    if (!user) throw unknownResetLink()
    const now = new Date()
    await user.update({ passwordHash, sessionVersion: user.sessionVersion + 1 }, { transaction })
    await reset.update({ usedAt: now }, { transaction })
    await PasswordReset.update({ expiresAt: now }, { where: { userId: user.id, usedAt: null, expiresAt: { [Op.gt]: now } }, transaction })
    const email = normaliseEmail(user.email)
    await SignInLock.destroy({ where: { email }, transaction })
    await SignInFailure.destroy({ where: { email }, transaction })
    return { email: user.email }
  })
}
