import type { Caller } from '../../utils/auth'

// The token is 32 bytes in base64url: anything else cannot name a feed.
const FEED_PATH = /\/calendar\/([A-Za-z0-9_-]{43})\.ics$/

const gone = () => createError({ statusCode: 404, statusMessage: 'Not Found' })

/** A person's private calendar feed, public to whoever holds its secret URL; unknown or revoked is a bare 404. */
export default defineEventHandler(async (event) => {
  const token = FEED_PATH.exec(getRequestURL(event).pathname)?.[1]
  if (!token) throw gone()
  const { CalendarFeed, Membership, Organisation, User } = useModels()
  const feed = await CalendarFeed.findOne({ where: { tokenHash: hashFeedToken(token), revokedAt: null } })
  if (!feed) throw gone()
  // The role is read now, so a person who changed role or left the organisation sees what they may now.
  const [user, membership] = await Promise.all([
    User.findByPk(feed.userId),
    Membership.findOne({ where: { userId: feed.userId, organisationId: feed.organisationId }, include: [{ model: Organisation, as: 'organisation' }] }),
  ])
  if (!user || !membership?.organisation) throw gone()
  const caller: Caller = {
    userId: user.id,
    name: user.name,
    email: user.email,
    organisationId: membership.organisation.id,
    organisationName: membership.organisation.name,
    timeZone: membership.organisation.timeZone,
    ruleSet: membership.organisation.ruleSet,
    role: membership.role,
  }
  const cal = await buildFeed(caller)
  await feed.update({ lastUsedAt: new Date() })
  return sendCalendar(event, cal)
})
