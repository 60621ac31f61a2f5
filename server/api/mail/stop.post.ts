import { stopRemarkMail } from '../../services/notices'

// Public: the unsubscribe link of a digest works without signing in; the key is the proof.
export default defineEventHandler(async (event) => {
  const { key } = await readBodyWith(event, mailStopSchema)
  if (!(await stopRemarkMail(key))) throw createError({ statusCode: 404, statusMessage: 'That link is not known (it may be from an old message). Choose your e-mail settings on your account page.' })
  return { ok: true, remarkMail: 'none' as const }
})
