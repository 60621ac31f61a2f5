// Roles and states shared by the client and the server.
export type SiteRole = 'admin' | 'member'
export type CompanionRole = 'reader' | 'reviewer' | 'author' | 'editor'
export type CompanionState = 'draft' | 'in_review' | 'revising' | 'accepted' | 'published' | 'withdrawn'

/** Companion roles in increasing order of what they may do. */
export const companionRoleOrder: readonly CompanionRole[] = ['reader', 'reviewer', 'author', 'editor']

export const companionStateLabel: Record<CompanionState, string> = {
  draft: 'draft',
  in_review: 'in review',
  revising: 'revising',
  accepted: 'accepted',
  published: 'published',
  withdrawn: 'withdrawn',
}

export const companionRoleLabel: Record<CompanionRole, string> = {
  reader: 'Reader',
  reviewer: 'Reviewer',
  author: 'Author',
  editor: 'Editor',
}

/** True when `role` is at least `minimum` in the role order. */
export function roleAtLeast(role: CompanionRole | null | undefined, minimum: CompanionRole): boolean {
  if (!role) return false
  return companionRoleOrder.indexOf(role) >= companionRoleOrder.indexOf(minimum)
}
