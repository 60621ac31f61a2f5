// Adds who is calling to the event context for API and file requests: the signed-in account and
// its session (cookie), or an API token (Authorization: Bearer qft_…) — never both.
export default defineEventHandler(async (event) => {
  event.context.user = null
  event.context.session = null
  event.context.token = null
  if (!event.path.startsWith('/api/') && !event.path.startsWith('/files/')) return
  const token = await tokenFromRequest(event).catch(error => rethrowUnavailable(error, 'The database'))
  if (token) {
    event.context.token = token
    return
  }
  const auth = useLucia()
  const sessionId = getCookie(event, auth.sessionCookieName)
  if (!sessionId) return
  const { session, user } = await auth.validateSession(sessionId).catch(error => rethrowUnavailable(error, 'The database'))
  if (session?.fresh) appendResponseHeader(event, 'Set-Cookie', auth.createSessionCookie(session.id).serialize())
  if (!session) appendResponseHeader(event, 'Set-Cookie', auth.createBlankSessionCookie().serialize())
  event.context.session = session
  event.context.user = user
})
