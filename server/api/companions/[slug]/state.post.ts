import { moveCompanion } from '../../../services/course'

// Moves the companion along its course; authors submit and resubmit, the editor makes the other moves.
export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const input = await readBodyWith(event, moveSchema)
  const access = await requireCompanionRole(event, slug, 'author', { whileSettled: true })
  return moveCompanion(event, access, input)
})
