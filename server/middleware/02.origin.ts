// Refuses state-changing API requests made with the session cookie whose Origin is not this site (cross-site request forgery).
import { verifyRequestOrigin } from 'lucia'

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS'])

export default defineEventHandler((event) => {
  if (!event.path.startsWith('/api/') || safeMethods.has(event.method)) return
  // Token requests carry no cookie, so a forged cross-site request cannot use them.
  if (event.context.token) return
  const origin = getRequestHeader(event, 'origin')
  const host = useRuntimeConfig().trustProxy
    ? getRequestHeader(event, 'x-forwarded-host') ?? getRequestHeader(event, 'host')
    : getRequestHeader(event, 'host')
  if (!origin || !host || !verifyRequestOrigin(origin, [host])) {
    throw createError({ statusCode: 403, statusMessage: 'This request did not come from a Quillfield page (origin check failed).' })
  }
})
