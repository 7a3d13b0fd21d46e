const OPEN = ['/api/auth/', '/api/health', '/api/demo/']

/** Every /api route but sign-in and health needs a session; routes check role and organisation themselves. */
export default defineEventHandler(async (event) => {
  const path = event.path.split('?')[0]!
  if (!path.startsWith('/api/') || OPEN.some(open => path === open || path.startsWith(open))) return
  await requireSignedIn(event)
})
