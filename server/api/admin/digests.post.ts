import { z } from 'zod'
import { sendDigests } from '../../services/notices'

const digestRunSchema = z.object({}).strict()

export default defineEventHandler(async (event) => {
  await readBodyWith(event, digestRunSchema)
  requireSiteAdmin(event)
  return { sent: await sendDigests(siteUrl(event)) }
})
