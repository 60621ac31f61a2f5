// Adds the signed-in account and its session to the event context for API requests.
export default defineEventHandler(async (event) => {
  event.context.user = null
  event.context.session = null
  if (!event.path.startsWith('/api/')) return
  const auth = useLucia()
  const sessionId = getCookie(event, auth.sessionCookieName)
  if (!sessionId) return
  const { session, user } = await auth.validateSession(sessionId)
  if (session?.fresh) appendResponseHeader(event, 'Set-Cookie', auth.createSessionCookie(session.id).serialize())
  if (!session) appendResponseHeader(event, 'Set-Cookie', auth.createBlankSessionCookie().serialize())
  event.context.session = session
  event.context.user = user
})
