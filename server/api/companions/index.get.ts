import { z } from 'zod'
import { listVisibleCompanions } from '../../services/companions'

const query = z.object({ q: z.string().trim().max(200).optional() })

export default defineEventHandler(async (event) => {
  const { q } = readQueryWith(event, query)
  const companions = await listVisibleCompanions(event.context.user, q || undefined)
  return { companions }
})
