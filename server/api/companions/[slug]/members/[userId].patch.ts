import { changeMemberRole } from '../../../../services/companions'

export default defineEventHandler(async (event) => {
  const { slug, userId } = readParamsWith(event, memberParams)
  const input = await readBodyWith(event, memberUpdateSchema)
  const { companion } = await requireCompanionRole(event, slug, 'editor')
  await changeMemberRole(companion.id, userId, input.role)
  return { ok: true }
})
