// Companions and their members.
import type { User } from 'lucia'
import type { CompanionRole } from '#shared/types/roles'
import type { CompanionCreateInput } from '#shared/utils/validation'

export interface CompanionSummary {
  slug: string
  title: string
  state: (typeof tables.companions.$inferSelect)['state']
  manuscriptRef: string
  role: CompanionRole | null
  updatedAt: Date
}

/** Companions the caller may see: their memberships, every published one, everything for admins. */
export async function listVisibleCompanions(user: User | null, search?: string): Promise<CompanionSummary[]> {
  const db = useDB()
  const c = tables.companions
  const m = tables.memberships
  const text = search ? like(c.title, `%${search.replace(/[\\%_]/g, ch => `\\${ch}`)}%`) : undefined
  const visible = user?.siteRole === 'admin'
    ? undefined
    : user
      ? or(eq(c.state, 'published'), sql`${m.userId} IS NOT NULL`)
      : eq(c.state, 'published')
  const rows = await db.select({
    slug: c.slug, title: c.title, state: c.state, manuscriptRef: c.manuscriptRef, updatedAt: c.updatedAt, role: m.role,
  }).from(c)
    .leftJoin(m, and(eq(m.companionId, c.id), eq(m.userId, user?.id ?? '')))
    .where(and(visible, text))
    .orderBy(desc(c.updatedAt), asc(c.slug))
    .limit(200)
  return rows.map(r => ({ ...r, role: r.role ?? null }))
}

export async function createCompanion(user: User, input: CompanionCreateInput): Promise<string> {
  const db = useDB()
  return db.transaction(async (tx) => {
    const [taken] = await tx.select({ id: tables.companions.id }).from(tables.companions).where(eq(tables.companions.slug, input.slug)).limit(1)
    if (taken) {
      throw createError({ statusCode: 409, statusMessage: 'That short name is taken.', data: { fields: { slug: 'That short name is taken; choose another.' } } })
    }
    const [created] = await tx.insert(tables.companions).values({
      slug: input.slug,
      title: input.title,
      abstract: input.abstract,
      manuscriptRef: input.manuscriptRef,
      createdBy: user.id,
    }).$returningId()
    if (!created) throw createError({ statusCode: 500, statusMessage: 'The companion was not stored.' })
    await tx.insert(tables.memberships).values({ companionId: created.id, userId: user.id, role: 'editor' })
    return input.slug
  })
}

export interface MemberView {
  userId: string
  displayName: string
  email: string
  affiliation: string
  role: CompanionRole
  since: Date
}

export async function listMembers(companionId: number): Promise<MemberView[]> {
  const m = tables.memberships
  const u = tables.users
  const rows = await useDB().select({
    userId: u.id, displayName: u.displayName, email: u.email, affiliation: u.affiliation, role: m.role, since: m.createdAt,
  }).from(m).innerJoin(u, eq(u.id, m.userId)).where(eq(m.companionId, companionId)).orderBy(asc(m.createdAt), asc(u.displayName))
  const order = companionRoleOrder
  return rows.sort((a, b) => order.indexOf(b.role) - order.indexOf(a.role))
}

export async function addMember(companionId: number, email: string, role: CompanionRole): Promise<MemberView> {
  const db = useDB()
  const [account] = await db.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.email, email)).limit(1)
  if (!account) {
    throw createError({ statusCode: 422, statusMessage: 'No account uses that address.', data: { fields: { email: 'No account uses that address; ask them to sign up first.' } } })
  }
  const [existing] = await db.select({ role: tables.memberships.role }).from(tables.memberships)
    .where(and(eq(tables.memberships.companionId, companionId), eq(tables.memberships.userId, account.id))).limit(1)
  if (existing) {
    throw createError({ statusCode: 409, statusMessage: `That person is already a member (${existing.role}).`, data: { fields: { email: `Already a member as ${existing.role}; change the role in the list instead.` } } })
  }
  await insertMembership(companionId, account.id, role)
  const member = (await listMembers(companionId)).find(x => x.userId === account.id)
  if (!member) throw createError({ statusCode: 500, statusMessage: 'The membership was not stored.' })
  return member
}

/** Reviewers get the next number in their companion ("Reviewer 3"), kept for good. */
async function nextReviewerNumber(companionId: number): Promise<number> {
  const [row] = await useDB().select({ n: sql<number | null>`MAX(${tables.memberships.reviewerNumber})` }).from(tables.memberships)
    .where(eq(tables.memberships.companionId, companionId))
  return Number(row?.n ?? 0) + 1
}

/** Adds a membership (reviewers numbered); used by the editor's list and by accepted invitations. */
export async function insertMembership(companionId: number, userId: string, role: CompanionRole): Promise<void> {
  const reviewerNumber = role === 'reviewer' ? await nextReviewerNumber(companionId) : null
  await useDB().insert(tables.memberships).values({ companionId, userId, role, reviewerNumber })
}

async function editorCount(companionId: number): Promise<number> {
  const [row] = await useDB().select({ n: count() }).from(tables.memberships)
    .where(and(eq(tables.memberships.companionId, companionId), eq(tables.memberships.role, 'editor')))
  return row?.n ?? 0
}

async function currentRole(companionId: number, userId: string): Promise<CompanionRole> {
  const [row] = await useDB().select({ role: tables.memberships.role }).from(tables.memberships)
    .where(and(eq(tables.memberships.companionId, companionId), eq(tables.memberships.userId, userId))).limit(1)
  if (!row) throw createError({ statusCode: 404, statusMessage: 'That person is not a member of this companion.' })
  return row.role
}

const lastEditor = () => createError({ statusCode: 409, statusMessage: 'A companion keeps at least one editor: make someone else editor first.' })

export async function changeMemberRole(companionId: number, userId: string, role: CompanionRole): Promise<void> {
  const before = await currentRole(companionId, userId)
  if (before === 'editor' && role !== 'editor' && await editorCount(companionId) <= 1) throw lastEditor()
  const [row] = await useDB().select({ reviewerNumber: tables.memberships.reviewerNumber }).from(tables.memberships)
    .where(and(eq(tables.memberships.companionId, companionId), eq(tables.memberships.userId, userId))).limit(1)
  const reviewerNumber = role === 'reviewer' && !row?.reviewerNumber ? await nextReviewerNumber(companionId) : row?.reviewerNumber ?? null
  await useDB().update(tables.memberships).set({ role, reviewerNumber })
    .where(and(eq(tables.memberships.companionId, companionId), eq(tables.memberships.userId, userId)))
}

export async function removeMember(companionId: number, userId: string): Promise<void> {
  const before = await currentRole(companionId, userId)
  if (before === 'editor' && await editorCount(companionId) <= 1) throw lastEditor()
  await useDB().delete(tables.memberships)
    .where(and(eq(tables.memberships.companionId, companionId), eq(tables.memberships.userId, userId)))
}
