export default defineEventHandler(async (event) => {
  requireSiteAdmin(event)
  const u = tables.users
  const users = await useDB().select({
    id: u.id, email: u.email, displayName: u.displayName, affiliation: u.affiliation, siteRole: u.siteRole, createdAt: u.createdAt,
  }).from(u).orderBy(asc(u.displayName)).limit(1000)
  return { users }
})
