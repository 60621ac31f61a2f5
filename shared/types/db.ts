import type { companions, memberships, users } from '../../server/db/schema'

export type UserRow = typeof users.$inferSelect
export type CompanionRow = typeof companions.$inferSelect
export type MembershipRow = typeof memberships.$inferSelect
export type NewCompanion = typeof companions.$inferInsert
