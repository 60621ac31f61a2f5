// Access guards. Each returns what it checked, so handlers never repeat an access query.
import type { H3Event } from 'h3'
import type { User } from 'lucia'
import type { CompanionRole } from '#shared/types/roles'
import type { CompanionRow } from '#shared/types/db'

export function requireUser(event: H3Event): User {
  const user = event.context.user
  if (!user) throw createError({ statusCode: 401, statusMessage: 'Sign in to continue.' })
  return user
}

export function requireSiteAdmin(event: H3Event): User {
  const user = requireUser(event)
  if (user.siteRole !== 'admin') throw createError({ statusCode: 403, statusMessage: 'Only site administrators may do this.' })
  return user
}

export interface CompanionAccess {
  companion: CompanionRow
  /** The caller's effective role: a membership, editor for site admins, reader for a published companion. */
  role: CompanionRole
  /** The membership role itself (null for admins and the public). */
  membershipRole: CompanionRole | null
  user: User | null
}

/** What the caller may do in a companion, or null when they may not see it at all. */
export async function findCompanionAccess(event: H3Event, slug: string): Promise<CompanionAccess | null> {
  const db = useDB()
  const user = event.context.user
  const [companion] = await db.select().from(tables.companions).where(eq(tables.companions.slug, slug)).limit(1)
  if (!companion) return null
  let membershipRole: CompanionRole | null = null
  if (user) {
    const [membership] = await db.select({ role: tables.memberships.role }).from(tables.memberships)
      .where(and(eq(tables.memberships.companionId, companion.id), eq(tables.memberships.userId, user.id))).limit(1)
    membershipRole = membership?.role ?? null
  }
  let role: CompanionRole | null = membershipRole
  if (user?.siteRole === 'admin') role = 'editor'
  else if (!role && companion.state === 'published') role = 'reader'
  if (!role) return null
  return { companion, role, membershipRole, user: user ?? null }
}

/**
 * The companion and the caller's role, when the role is at least `minimum`.
 * A companion the caller may not see answers 404, so that its existence does not leak.
 */
export async function requireCompanionRole(event: H3Event, slug: string, minimum: CompanionRole): Promise<CompanionAccess> {
  const access = await findCompanionAccess(event, slug)
  if (!access) throw createError({ statusCode: 404, statusMessage: 'No companion by that name.' })
  if (!roleAtLeast(access.role, minimum)) {
    if (!access.user) throw createError({ statusCode: 401, statusMessage: 'Sign in to continue.' })
    throw createError({ statusCode: 403, statusMessage: `This needs the ${minimum} role in this companion.` })
  }
  return access
}
