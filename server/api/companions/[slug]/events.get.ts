import { listEvents } from '../../../services/course'

// The audit trail: everything for the editor; the moves along the course for authors.
export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const access = await requireCompanionRole(event, slug, 'author')
  return { events: await listEvents(access) }
})
