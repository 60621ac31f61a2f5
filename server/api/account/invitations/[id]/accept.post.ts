import { z } from 'zod'
import { acceptWaitingInvitation } from '../../../../services/invitations'

export default defineEventHandler(async (event) => {
  const { id } = readParamsWith(event, z.object({ id: z.coerce.number().int().positive() }))
  const user = requireUser(event)
  return acceptWaitingInvitation(user, id)
})
