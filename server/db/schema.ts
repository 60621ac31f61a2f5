// The relational schema (MariaDB through Drizzle). Columns are snake_case; ids of accounts
// and sessions are random strings (lucia), companions use auto-increment keys.
import { relations, sql } from 'drizzle-orm'
import {
  bigint, datetime, index, int, mysqlEnum, mysqlTable, text, timestamp, uniqueIndex, varchar,
} from 'drizzle-orm/mysql-core'

const timestamps = {
  createdAt: timestamp('created_at', { mode: 'date' }).notNull().default(sql`CURRENT_TIMESTAMP`),
  updatedAt: timestamp('updated_at', { mode: 'date' }).notNull().default(sql`CURRENT_TIMESTAMP`).onUpdateNow(),
}

export const SITE_ROLES = ['admin', 'member'] as const
export const COMPANION_ROLES = ['reader', 'reviewer', 'author', 'editor'] as const
export const COMPANION_STATES = ['draft', 'in_review', 'revising', 'accepted', 'published', 'withdrawn'] as const

export const users = mysqlTable('user', {
  id: varchar('id', { length: 40 }).primaryKey(),
  email: varchar('email', { length: 254 }).notNull(),
  passwordHash: varchar('password_hash', { length: 255 }).notNull(),
  displayName: varchar('display_name', { length: 120 }).notNull(),
  affiliation: varchar('affiliation', { length: 200 }).notNull().default(''),
  orcid: varchar('orcid', { length: 19 }),
  siteRole: mysqlEnum('site_role', SITE_ROLES).notNull().default('member'),
  ...timestamps,
}, t => [uniqueIndex('user_email_unique').on(t.email)])

export const sessions = mysqlTable('session', {
  id: varchar('id', { length: 255 }).primaryKey(),
  userId: varchar('user_id', { length: 40 }).notNull().references(() => users.id, { onDelete: 'cascade' }),
  expiresAt: datetime('expires_at').notNull(),
}, t => [index('session_user_idx').on(t.userId)])

export const companions = mysqlTable('companion', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  slug: varchar('slug', { length: 64 }).notNull(),
  title: varchar('title', { length: 300 }).notNull(),
  abstract: text('abstract').notNull(),
  manuscriptRef: varchar('manuscript_ref', { length: 120 }).notNull().default(''),
  state: mysqlEnum('state', COMPANION_STATES).notNull().default('draft'),
  createdBy: varchar('created_by', { length: 40 }).references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [uniqueIndex('companion_slug_unique').on(t.slug), index('companion_state_idx').on(t.state)])

export const memberships = mysqlTable('membership', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  companionId: bigint('companion_id', { mode: 'number', unsigned: true }).notNull().references(() => companions.id, { onDelete: 'cascade' }),
  userId: varchar('user_id', { length: 40 }).notNull().references(() => users.id, { onDelete: 'cascade' }),
  role: mysqlEnum('role', COMPANION_ROLES).notNull(),
  ...timestamps,
}, t => [uniqueIndex('membership_companion_user_unique').on(t.companionId, t.userId), index('membership_user_idx').on(t.userId)])

// Failed sign-in attempts, counted per account key and per client address.
export const signInThrottle = mysqlTable('sign_in_throttle', {
  key: varchar('throttle_key', { length: 300 }).primaryKey(),
  failures: int('failures').notNull().default(0),
  windowStart: datetime('window_start').notNull(),
  lockedUntil: datetime('locked_until'),
})

export const usersRelations = relations(users, ({ many }) => ({
  memberships: many(memberships),
  sessions: many(sessions),
}))

export const companionsRelations = relations(companions, ({ many, one }) => ({
  memberships: many(memberships),
  creator: one(users, { fields: [companions.createdBy], references: [users.id] }),
}))

export const membershipsRelations = relations(memberships, ({ one }) => ({
  companion: one(companions, { fields: [memberships.companionId], references: [companions.id] }),
  user: one(users, { fields: [memberships.userId], references: [users.id] }),
}))
