import type { companionEvents, companions, invitations, memberships, remarks, users } from '../../server/db/schema'

export type UserRow = typeof users.$inferSelect
export type CompanionRow = typeof companions.$inferSelect
export type MembershipRow = typeof memberships.$inferSelect
export type NewCompanion = typeof companions.$inferInsert
export type InvitationRow = typeof invitations.$inferSelect
export type RemarkRow = typeof remarks.$inferSelect
export type CompanionEventRow = typeof companionEvents.$inferSelect
