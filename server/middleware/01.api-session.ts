// Open without a session: sign-in, health, the demo sign-ins, and the links people follow from
// mail (invitation, password reset, unsubscribe), which carry their own single-purpose token.
const OPEN = ['/api/auth/', '/api/health', '/api/demo/', '/api/public/']

/** Every /api route but those above needs a session; routes check role and organisation themselves. */
export default defineEventHandler(async (event) => {
  const path = event.path.split('?')[0]!
  if (!path.startsWith('/api/') || OPEN.some(open => path === open || path.startsWith(open))) return
  await requireSignedIn(event)
})
