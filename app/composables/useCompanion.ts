// One companion and the caller's role in it; a missing or private companion is a 404 page.
export async function useCompanion(slug: string) {
  const result = await useFetch(`/api/companions/${slug}`, { key: `companion-${slug}` })
  if (result.error.value || !result.data.value) {
    throw createError({ statusCode: result.error.value?.statusCode ?? 404, statusMessage: 'No companion by that name.', fatal: true })
  }
  return result
}
