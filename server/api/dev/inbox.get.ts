import { z } from 'zod'

// The development inbox: what the app sent to the project's SMTP fake. Absent in production
// and wherever no fake is configured (NUXT_MAIL_INBOX_URL empty).
const query = z.object({ to: z.string().trim().toLowerCase().max(254).optional() })

export default defineEventHandler(async (event) => {
  const config = useRuntimeConfig(event)
  if (config.deployment === 'production' || !config.mailInboxUrl) throw createError({ statusCode: 404, statusMessage: 'There is no development inbox here.' })
  refuseApiToken(event)
  const { to } = readQueryWith(event, query)
  // Only this deployment's messages (the tests and the demo may share one fake).
  const search = new URLSearchParams({ deployment: String(config.deployment), ...(to ? { to } : {}) })
  const url = `${String(config.mailInboxUrl).replace(/\/+$/, '')}/messages?${search}`
  try {
    const reply = await $fetch<{ messages: Array<{ id: number, to: string[], from: string, subject: string, text: string, html: string, date: string }> }>(url, { timeout: 3000 })
    return { messages: reply.messages.slice(0, 100), source: String(config.mailInboxUrl) }
  }
  catch (error) {
    throw createError({ statusCode: 503, statusMessage: `The SMTP fake at ${config.mailInboxUrl} did not answer (${(error as Error).message}). Start it with npm run services:start.` })
  }
})
