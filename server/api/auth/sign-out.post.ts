export default defineEventHandler(async (event) => {
  requireUser(event)
  await endSession(event)
  setResponseStatus(event, 204)
  return null
})
