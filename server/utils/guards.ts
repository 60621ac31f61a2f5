// Access guards. Each returns what it checked, so handlers never repeat an access query.
import type { H3Event } from 'h3'
import type { User } from 'lucia'
import type { CompanionRole } from '#shared/types/roles'
import type { CompanionRow } from '#shared/types/db'
import { SETTLED_STATES } from '#shared/review/course'

/** Refuses API tokens on routes meant for people in a browser. */
export function refuseApiToken(event: H3Event): void {
  refuseToken(event)
}

function refuseToken(event: H3Event): void {
  if (event.context.token) throw createError({ statusCode: 403, statusMessage: 'API tokens are accepted only by the ensemble routes of their companion.' })
}

export function requireUser(event: H3Event): User {
  refuseToken(event)
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
  return lookUpAccess(event, slug).catch(error => rethrowUnavailable(error, 'The database'))
}

async function lookUpAccess(event: H3Event, slug: string): Promise<CompanionAccess | null> {
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

export type TokenScope = 'ensembles:read' | 'ensembles:write'

/** Access through an API token: its companion only, within its scope, as its maker's role there. */
async function tokenAccess(event: H3Event, slug: string, minimum: CompanionRole, scope: TokenScope | undefined): Promise<CompanionAccess> {
  const token = event.context.token!
  if (!scope) refuseToken(event)
  const db = useDB()
  const [companion] = await db.select().from(tables.companions).where(eq(tables.companions.slug, slug)).limit(1)
  if (!companion || companion.id !== token.companionId) throw createError({ statusCode: 404, statusMessage: 'No companion by that name.' })
  if (!token.scopes.includes(scope!)) throw createError({ statusCode: 403, statusMessage: `This API token lacks the scope ${scope}.` })
  const [maker] = await db.select().from(tables.users).where(eq(tables.users.id, token.userId)).limit(1)
  const [membership] = await db.select({ role: tables.memberships.role }).from(tables.memberships)
    .where(and(eq(tables.memberships.companionId, companion.id), eq(tables.memberships.userId, token.userId))).limit(1)
  const role = maker?.siteRole === 'admin' ? 'editor' : membership?.role
  if (!maker || !role) throw createError({ statusCode: 404, statusMessage: 'No companion by that name.' })
  if (!roleAtLeast(role, minimum)) throw createError({ statusCode: 403, statusMessage: `The token's maker no longer has the ${minimum} role here.` })
  const user: User = { id: maker.id, email: maker.email, displayName: maker.displayName, affiliation: maker.affiliation, orcid: maker.orcid, siteRole: maker.siteRole }
  return { companion, role, membershipRole: membership?.role ?? null, user }
}

/**
 * The companion and the caller's role, when the role is at least `minimum`.
 * A companion the caller may not see answers 404, so that its existence does not leak.
 * Routes that accept API tokens name the scope a token needs.
 */
export async function requireCompanionRole(event: H3Event, slug: string, minimum: CompanionRole, options: { tokenScope?: TokenScope, whileSettled?: boolean } = {}): Promise<CompanionAccess> {
  const access = event.context.token ? await tokenAccess(event, slug, minimum, options.tokenScope) : await findCompanionAccess(event, slug)
  if (!access) throw createError({ statusCode: 404, statusMessage: 'No companion by that name.' })
  if (!roleAtLeast(access.role, minimum)) {
    if (!access.user) throw createError({ statusCode: 401, statusMessage: 'Sign in to continue.' })
    throw createError({ statusCode: 403, statusMessage: `This needs the ${minimum} role in this companion.` })
  }
  refuseChangeWhenSettled(event, access, minimum, options.whileSettled)
  return access
}

/**
 * Once a companion is accepted, published or withdrawn, authors no longer change it (the editor
 * still may, e.g. to correct a published companion, or reopen it for revision).
 */
function refuseChangeWhenSettled(event: H3Event, access: CompanionAccess, minimum: CompanionRole, whileSettled = false): void {
  if (whileSettled || minimum !== 'author' || access.role === 'editor') return
  if (['GET', 'HEAD'].includes(event.method)) return
  if (!SETTLED_STATES.includes(access.companion.state)) return
  throw createError({ statusCode: 409, statusMessage: `The companion is ${companionStateLabel[access.companion.state]}: authors no longer change it. Ask the editor to reopen it for revision.` })
}
