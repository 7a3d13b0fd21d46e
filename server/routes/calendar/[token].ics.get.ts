// The token is 32 bytes in base64url: anything else cannot name a feed.
const FEED_PATH = /\/calendar\/([A-Za-z0-9_-]{43})\.ics$/

const gone = () => createError({ statusCode: 404, statusMessage: 'Not Found' })

/** A person's private calendar feed, public to whoever holds its secret URL; unknown or revoked is a bare 404. */
export default defineEventHandler(async (event) => {
  const token = FEED_PATH.exec(getRequestURL(event).pathname)?.[1]
  if (!token) throw gone()
  const feed = await useModels().CalendarFeed.findOne({ where: { tokenHash: hashFeedToken(token), revokedAt: null } })
  if (!feed) throw gone()
  // The role is read now, so a person who changed role or left the organisation sees what they may now.
  const caller = await callerFor(feed.userId, feed.organisationId)
  if (!caller) throw gone()
  const cal = await buildFeed(caller)
  await feed.update({ lastUsedAt: new Date() })
  return sendCalendar(event, cal)
})
