export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { companion, role, membershipRole } = await requireCompanionRole(event, slug, 'reader')
  return {
    companion: {
      slug: companion.slug,
      title: companion.title,
      abstract: companion.abstract,
      manuscriptRef: companion.manuscriptRef,
      state: companion.state,
      license: companion.license,
      identitiesOpen: companion.identitiesOpen,
      remarksPublic: companion.remarksPublic,
      publishedAt: companion.publishedAt,
      publishedRevision: companion.publishedRevision,
      createdAt: companion.createdAt,
      updatedAt: companion.updatedAt,
    },
    role,
    membershipRole,
  }
})
