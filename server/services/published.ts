// The public list of published companions, searchable by the words of their title, abstract,
// manuscript reference and the names of their authors. Reviewers' names are never searched or
// shown here: a reader must not learn who reviewed a companion by searching for them.
import type { LicenseId } from '#shared/utils/citation'
import { nameFor } from './identity'

export const PUBLISHED_PAGE_SIZE = 20

export interface PublishedItem {
  slug: string
  title: string
  abstract: string
  manuscriptRef: string
  publishedAt: Date | null
  license: LicenseId
  authors: string[]
}

export interface PublishedPage {
  items: PublishedItem[]
  total: number
  page: number
  pageSize: number
}

const likePattern = (word: string) => `%${word.replace(/[\\%_]/g, ch => `\\${ch}`)}%`

/** Display names of a companion's members with the role author, in the order they joined. */
export async function authorNames(companion: typeof tables.companions.$inferSelect): Promise<string[]> {
  const m = tables.memberships
  const u = tables.users
  const rows = await useDB().select({ userId: u.id, displayName: u.displayName, role: m.role, reviewerNumber: m.reviewerNumber })
    .from(m).innerJoin(u, eq(u.id, m.userId))
    .where(and(eq(m.companionId, companion.id), eq(m.role, 'author')))
    .orderBy(asc(m.createdAt), asc(m.id))
  // Shown as the public sees them (a reader with no membership), through the one naming rule.
  const publicView = { role: 'reader' as const, membershipRole: null, companion, user: null }
  return rows.map(r => nameFor(publicView, r).name)
}

export async function listPublished(query: string, page: number): Promise<PublishedPage> {
  const c = tables.companions
  const words = query.split(/\s+/).filter(Boolean).slice(0, 12)
  const matches = words.map((word) => {
    const pattern = likePattern(word)
    return or(
      like(c.title, pattern),
      like(c.abstract, pattern),
      like(c.manuscriptRef, pattern),
      sql`EXISTS (SELECT 1 FROM ${tables.memberships} am INNER JOIN ${tables.users} au ON au.id = am.user_id
        WHERE am.companion_id = ${c.id} AND am.role = 'author' AND au.display_name LIKE ${pattern})`,
    )
  })
  const where = and(eq(c.state, 'published'), ...matches)
  const db = useDB()
  const [counted] = await db.select({ n: count() }).from(c).where(where)
  const rows = await db.select().from(c).where(where)
    .orderBy(desc(c.publishedAt), asc(c.slug))
    .limit(PUBLISHED_PAGE_SIZE).offset((page - 1) * PUBLISHED_PAGE_SIZE)
  const items = await Promise.all(rows.map(async row => ({
    slug: row.slug,
    title: row.title,
    abstract: row.abstract,
    manuscriptRef: row.manuscriptRef,
    publishedAt: row.publishedAt,
    license: row.license,
    authors: await authorNames(row),
  })))
  return { items, total: counted?.n ?? 0, page, pageSize: PUBLISHED_PAGE_SIZE }
}
