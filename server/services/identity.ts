// How people appear to each other inside a companion. Reviewers are anonymous to authors (and to
// readers of published remarks) as "Reviewer <n>" unless the editor opens identities; editors,
// admins and the reviewers themselves always see names. Every route that shows who wrote or did
// something passes its names through `nameFor`, so no name reaches an author by another path.
import type { CompanionAccess } from '../utils/guards'

export interface Person {
  userId: string | null
  displayName: string
  /** The person's role in the companion (null when they are no longer a member). */
  role: string | null
  reviewerNumber: number | null
}

export interface ShownPerson {
  /** Only present when the viewer may know who it is. */
  userId: string | null
  name: string
  role: string | null
  anonymous: boolean
  /** True when the viewer is this person. */
  self: boolean
}

/** May this viewer see reviewers' names in this companion? */
export function seesReviewerNames(access: Pick<CompanionAccess, 'role' | 'membershipRole' | 'companion' | 'user'>): boolean {
  if (access.companion.identitiesOpen) return true
  if (access.user?.siteRole === 'admin') return true
  return access.role === 'editor'
}

export function nameFor(access: Pick<CompanionAccess, 'role' | 'membershipRole' | 'companion' | 'user'>, person: Person): ShownPerson {
  const self = person.userId !== null && person.userId === access.user?.id
  const hidden = person.role === 'reviewer' && !self && !seesReviewerNames(access) && access.role !== 'reviewer'
  // Reviewers do not see each other's names either, unless identities are open.
  const hiddenFromReviewer = person.role === 'reviewer' && !self && access.role === 'reviewer' && !access.companion.identitiesOpen && access.user?.siteRole !== 'admin'
  // Someone who left the companion: their role then is unknown (they may have reviewed).
  if (person.role === null && !self && !seesReviewerNames(access)) {
    return { userId: null, name: 'Former member', role: null, anonymous: true, self: false }
  }
  if (hidden || hiddenFromReviewer) {
    return { userId: null, name: `Reviewer ${person.reviewerNumber ?? '?'}`, role: 'reviewer', anonymous: true, self: false }
  }
  return { userId: person.userId, name: person.displayName || 'Former member', role: person.role, anonymous: false, self }
}

/** The members of a companion as Person records, keyed by user id (for naming authors of remarks and events). */
export async function peopleOf(companionId: number): Promise<Map<string, Person>> {
  const m = tables.memberships
  const u = tables.users
  const rows = await useDB().select({ userId: u.id, displayName: u.displayName, role: m.role, reviewerNumber: m.reviewerNumber })
    .from(m).innerJoin(u, eq(u.id, m.userId)).where(eq(m.companionId, companionId))
  return new Map(rows.map(r => [r.userId, { ...r }]))
}

/** A Person for a user id that may have left the companion (then named from the account, role unknown). */
export async function personFor(people: Map<string, Person>, userId: string | null): Promise<Person> {
  if (!userId) return { userId: null, displayName: 'Former member', role: null, reviewerNumber: null }
  const known = people.get(userId)
  if (known) return known
  const [account] = await useDB().select({ displayName: tables.users.displayName }).from(tables.users).where(eq(tables.users.id, userId)).limit(1)
  return { userId, displayName: account?.displayName ?? 'Former member', role: null, reviewerNumber: null }
}
