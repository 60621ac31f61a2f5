export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const input = await readBodyWith(event, companionUpdateSchema)
  const { companion } = await requireCompanionRole(event, slug, 'editor')
  await useDB().update(tables.companions).set(input).where(eq(tables.companions.id, companion.id))
  return { ok: true }
})
