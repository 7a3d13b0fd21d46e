import { createHmac, timingSafeEqual } from 'node:crypto'
import type { UnsubscribeLookupView } from '../../shared/types/weekly'
import { appUrl, cancelWaitingMail } from './mail'

// Unsubscribe links need no table: the token is the user id, the organisation id and an
// HMAC-SHA256 of both and the kind under the app's secret, so it cannot be made up or altered,
// and the same person always gets the same link. Changing NUXT_AUTH_SECRET ends every old link.

const KIND = 'weekly_status'

function signature(userId: number, organisationId: number, secret: string): string {
  return createHmac('sha256', secret).update(`bloomline-unsubscribe\n${userId}\n${organisationId}\n${KIND}`).digest('base64url')
}

function secret(): string {
  const value = useRuntimeConfig().authSecret as string | undefined
  if (!value) throw new Error('NUXT_AUTH_SECRET is not set: unsubscribe links cannot be signed.')
  return value
}

/** The token of a person's weekly-status unsubscribe link for an organisation. */
export function unsubscribeToken(userId: number, organisationId: number): string {
  return `${userId}-${organisationId}-${signature(userId, organisationId, secret())}`
}

/** The person and organisation a token names, or null when it was not signed by this app. */
export function readUnsubscribeToken(token: string): { userId: number, organisationId: number } | null {
  const match = /^(\d{1,10})-(\d{1,10})-([\w-]{43})$/.exec(token)
  if (!match) return null
  const userId = Number(match[1])
  const organisationId = Number(match[2])
  const given = Buffer.from(match[3]!)
  const expected = Buffer.from(signature(userId, organisationId, secret()))
  // Compared in constant time, so the answer's timing does not give the signature away.
  return given.length === expected.length && timingSafeEqual(given, expected) ? { userId, organisationId } : null
}

/** The page a message links to (it asks before it unsubscribes) and the RFC 8058 one-click address. */
export function unsubscribeLinks(userId: number, organisationId: number) {
  const token = unsubscribeToken(userId, organisationId)
  return { unsubscribePage: appUrl(`/unsubscribe/${token}`), oneClick: appUrl(`/api/public/unsubscribe/${token}`) }
}

/**
 * Stops (or starts again) a person's weekly status from an organisation; doing it twice changes
 * nothing. Stopping also withdraws a weekly status of theirs still waiting in the outbox, so it
 * takes effect at once; one already on its way may still arrive.
 */
export async function setWeeklySubscribed(userId: number, organisationId: number, subscribed: boolean): Promise<void> {
  const { MailUnsubscribe, User } = useModels()
  if (subscribed) {
    await MailUnsubscribe.destroy({ where: { userId, organisationId, kind: KIND } })
    return
  }
  await MailUnsubscribe.findOrCreate({ where: { userId, organisationId, kind: KIND } })
  const user = await User.findByPk(userId)
  if (user) await cancelWaitingMail({ organisationId, kind: KIND, recipientEmail: user.email })
}

/** When a person unsubscribed from an organisation's weekly status, or null. */
export async function weeklyUnsubscribedAt(userId: number, organisationId: number): Promise<Date | null> {
  const row = await useModels().MailUnsubscribe.findOne({ where: { userId, organisationId, kind: KIND } })
  return row?.createdAt ?? null
}

/** What an unsubscribe token stands for; a 404 (the same for a forged token and one whose person or organisation is gone). */
export async function requireUnsubscribeLink(token: string): Promise<{ userId: number, organisationId: number, view: UnsubscribeLookupView }> {
  const read = readUnsubscribeToken(token)
  const { User, Organisation } = useModels()
  const [user, organisation] = read
    ? await Promise.all([User.findByPk(read.userId), Organisation.findByPk(read.organisationId)])
    : [null, null]
  if (!read || !user || !organisation) {
    throw createError({ statusCode: 404, statusMessage: 'Not Found', message: 'This unsubscribe link does not work. Check it was copied whole, or sign in to manage your mail.' })
  }
  const since = await weeklyUnsubscribedAt(user.id, organisation.id)
  return {
    ...read,
    view: {
      name: user.name,
      email: user.email,
      organisationName: organisation.name,
      kind: KIND,
      unsubscribed: since !== null,
      unsubscribedAt: since?.toISOString() ?? null,
    },
  }
}
