import { remarksWaitingFor } from '../../services/remarks'

// Open remarks waiting for the caller's answer, across the companions they take part in.
export default defineEventHandler(async (event) => {
  const user = requireUser(event)
  return { remarks: await remarksWaitingFor(user) }
})
