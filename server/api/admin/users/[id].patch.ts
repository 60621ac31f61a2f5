export default defineEventHandler(async (event) => {
  const { id } = readParamsWith(event, userParams)
  const input = await readBodyWith(event, siteRoleUpdateSchema)
  const admin = requireSiteAdmin(event)
  if (id === admin.id && input.siteRole !== 'admin') {
    throw createError({ statusCode: 409, statusMessage: 'You cannot remove your own administrator role; ask another administrator.' })
  }
  const [result] = await useDB().update(tables.users).set({ siteRole: input.siteRole }).where(eq(tables.users.id, id))
  if (result.affectedRows === 0) throw createError({ statusCode: 404, statusMessage: 'No account with that id.' })
  return { ok: true }
})
