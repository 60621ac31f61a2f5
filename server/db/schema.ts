// The relational schema (MariaDB through Drizzle). Columns are snake_case; ids of accounts
// and sessions are random strings (lucia), companions use auto-increment keys.
import { relations, sql } from 'drizzle-orm'
import {
  bigint, boolean, datetime, double, index, int, json, mediumtext, mysqlEnum, mysqlTable, text, timestamp, uniqueIndex, varchar,
} from 'drizzle-orm/mysql-core'

const timestamps = {
  createdAt: timestamp('created_at', { mode: 'date' }).notNull().default(sql`CURRENT_TIMESTAMP`),
  updatedAt: timestamp('updated_at', { mode: 'date' }).notNull().default(sql`CURRENT_TIMESTAMP`).onUpdateNow(),
}

export const SITE_ROLES = ['admin', 'member'] as const
export const COMPANION_ROLES = ['reader', 'reviewer', 'author', 'editor'] as const
export const COMPANION_STATES = ['draft', 'in_review', 'revising', 'accepted', 'published', 'withdrawn'] as const
export const REMARK_MAIL_PREFERENCES = ['immediate', 'daily', 'none'] as const
export const LICENSES = ['CC-BY-4.0', 'CC-BY-SA-4.0', 'CC0-1.0', 'ODC-By-1.0'] as const

export const users = mysqlTable('user', {
  id: varchar('id', { length: 40 }).primaryKey(),
  email: varchar('email', { length: 254 }).notNull(),
  passwordHash: varchar('password_hash', { length: 255 }).notNull(),
  displayName: varchar('display_name', { length: 120 }).notNull(),
  affiliation: varchar('affiliation', { length: 200 }).notNull().default(''),
  orcid: varchar('orcid', { length: 19 }),
  siteRole: mysqlEnum('site_role', SITE_ROLES).notNull().default('member'),
  // Set when the owner followed the link of an address-verification message.
  emailVerifiedAt: datetime('email_verified_at'),
  // How remark notifications reach the account: one message each, a daily digest, or none.
  remarkMail: mysqlEnum('remark_mail', REMARK_MAIL_PREFERENCES).notNull().default('immediate'),
  // A random key for the unsubscribe link of digests (no sign-in needed to use it).
  mailKey: varchar('mail_key', { length: 64 }).notNull().default(''),
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
  // The page authors write (Markdown with math and figure directives); every save is also a revision.
  pageText: mediumtext('page_text').notNull().default(''),
  license: mysqlEnum('license', LICENSES).notNull().default('CC-BY-4.0'),
  // Reviewers appear to authors as "Reviewer 1", "Reviewer 2" unless the editor opens identities.
  identitiesOpen: boolean('identities_open').notNull().default(false),
  // Remarks stay among members unless the editor publishes them with the companion.
  remarksPublic: boolean('remarks_public').notNull().default(false),
  publishedAt: datetime('published_at'),
  publishedRevision: varchar('published_revision', { length: 40 }),
  createdBy: varchar('created_by', { length: 40 }).references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [uniqueIndex('companion_slug_unique').on(t.slug), index('companion_state_idx').on(t.state)])

export const memberships = mysqlTable('membership', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  companionId: bigint('companion_id', { mode: 'number', unsigned: true }).notNull().references(() => companions.id, { onDelete: 'cascade' }),
  userId: varchar('user_id', { length: 40 }).notNull().references(() => users.id, { onDelete: 'cascade' }),
  role: mysqlEnum('role', COMPANION_ROLES).notNull(),
  // Reviewers are numbered in the order they joined; authors see "Reviewer <n>".
  reviewerNumber: int('reviewer_number'),
  ...timestamps,
}, t => [uniqueIndex('membership_companion_user_unique').on(t.companionId, t.userId), index('membership_user_idx').on(t.userId)])

// Failed sign-in attempts, counted per account key and per client address.
export const signInThrottle = mysqlTable('sign_in_throttle', {
  key: varchar('throttle_key', { length: 300 }).primaryKey(),
  failures: int('failures').notNull().default(0),
  windowStart: datetime('window_start').notNull(),
  lockedUntil: datetime('locked_until'),
})

export const ACCOUNT_TOKEN_PURPOSES = ['password_reset', 'verify_email'] as const

// One-use links sent by e-mail (password reset, address verification), stored as SHA-256 hashes.
export const accountTokens = mysqlTable('account_token', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  userId: varchar('user_id', { length: 40 }).notNull().references(() => users.id, { onDelete: 'cascade' }),
  purpose: mysqlEnum('purpose', ACCOUNT_TOKEN_PURPOSES).notNull(),
  tokenHash: varchar('token_hash', { length: 64 }).notNull(),
  expiresAt: datetime('expires_at').notNull(),
  usedAt: datetime('used_at'),
  createdAt: timestamp('created_at', { mode: 'date' }).notNull().default(sql`CURRENT_TIMESTAMP`),
}, t => [uniqueIndex('account_token_hash_unique').on(t.tokenHash), index('account_token_user_idx').on(t.userId)])

// Invitations by e-mail to a role in a companion: an expiring one-use link, stored as a hash.
export const invitations = mysqlTable('invitation', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  companionId: bigint('companion_id', { mode: 'number', unsigned: true }).notNull().references(() => companions.id, { onDelete: 'cascade' }),
  email: varchar('email', { length: 254 }).notNull(),
  role: mysqlEnum('role', COMPANION_ROLES).notNull(),
  message: text('message').notNull(),
  tokenHash: varchar('token_hash', { length: 64 }).notNull(),
  invitedBy: varchar('invited_by', { length: 40 }).references(() => users.id, { onDelete: 'set null' }),
  expiresAt: datetime('expires_at').notNull(),
  acceptedAt: datetime('accepted_at'),
  acceptedBy: varchar('accepted_by', { length: 40 }).references(() => users.id, { onDelete: 'set null' }),
  revokedAt: datetime('revoked_at'),
  createdAt: timestamp('created_at', { mode: 'date' }).notNull().default(sql`CURRENT_TIMESTAMP`),
}, t => [uniqueIndex('invitation_hash_unique').on(t.tokenHash), index('invitation_companion_idx').on(t.companionId)])

// The audit trail of a companion: state changes with their reasons, invitations, role changes,
// page edits, anonymity and remark settings. Append-only.
export const companionEvents = mysqlTable('companion_event', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  companionId: bigint('companion_id', { mode: 'number', unsigned: true }).notNull().references(() => companions.id, { onDelete: 'cascade' }),
  actorId: varchar('actor_id', { length: 40 }).references(() => users.id, { onDelete: 'set null' }),
  kind: varchar('kind', { length: 40 }).notNull(),
  fromState: mysqlEnum('from_state', COMPANION_STATES),
  toState: mysqlEnum('to_state', COMPANION_STATES),
  reason: text('reason').notNull(),
  detail: json('detail').$type<Record<string, string | number | boolean | null>>().notNull(),
  revision: varchar('revision', { length: 40 }),
  createdAt: timestamp('created_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
}, t => [index('companion_event_companion_idx').on(t.companionId, t.createdAt)])

export const REMARK_STATES = ['open', 'settled'] as const

/** Where a remark points: the whole figure, one datum (a clicked point) or a rectangle in data coordinates. */
export type RemarkAnchor
  = | { kind: 'figure' }
    | { kind: 'datum', x: number, y: number, series?: string, row?: number }
    | { kind: 'region', x0: number, x1: number, y0: number, y1: number }

// A remark: a thread on a figure of one revision of a companion.
export const remarks = mysqlTable('remark', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  companionId: bigint('companion_id', { mode: 'number', unsigned: true }).notNull().references(() => companions.id, { onDelete: 'cascade' }),
  figureNumber: int('figure_number').notNull(),
  revision: varchar('revision', { length: 40 }).notNull(),
  anchor: json('anchor').$type<RemarkAnchor>().notNull(),
  state: mysqlEnum('state', REMARK_STATES).notNull().default('open'),
  authorId: varchar('author_id', { length: 40 }).references(() => users.id, { onDelete: 'set null' }),
  settledBy: varchar('settled_by', { length: 40 }).references(() => users.id, { onDelete: 'set null' }),
  settledAt: datetime('settled_at'),
  ...timestamps,
}, t => [index('remark_companion_idx').on(t.companionId, t.figureNumber)])

// The messages of a remark's thread; the first is the remark itself.
export const remarkMessages = mysqlTable('remark_message', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  remarkId: bigint('remark_id', { mode: 'number', unsigned: true }).notNull().references(() => remarks.id, { onDelete: 'cascade' }),
  authorId: varchar('author_id', { length: 40 }).references(() => users.id, { onDelete: 'set null' }),
  body: text('body').notNull(),
  createdAt: timestamp('created_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
}, t => [index('remark_message_remark_idx').on(t.remarkId)])

// Notifications waiting for a daily digest (accounts that chose 'daily').
export const pendingNotices = mysqlTable('pending_notice', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  userId: varchar('user_id', { length: 40 }).notNull().references(() => users.id, { onDelete: 'cascade' }),
  companionId: bigint('companion_id', { mode: 'number', unsigned: true }).references(() => companions.id, { onDelete: 'cascade' }),
  subject: varchar('subject', { length: 300 }).notNull(),
  text: text('text').notNull(),
  link: varchar('link', { length: 500 }).notNull(),
  createdAt: timestamp('created_at', { mode: 'date' }).notNull().default(sql`CURRENT_TIMESTAMP`),
  sentAt: datetime('sent_at'),
}, t => [index('pending_notice_user_idx').on(t.userId, t.sentAt)])

export const ENSEMBLE_FORMATS = ['text', 'json', 'npy', 'zip'] as const

// One uploaded dataset: configurations sharing a geometry, dimension and convention. The raw file
// lives in object storage under a key derived from its SHA-256; the manifest commit records it too.
export const ensembles = mysqlTable('ensemble', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  companionId: bigint('companion_id', { mode: 'number', unsigned: true }).notNull().references(() => companions.id, { onDelete: 'cascade' }),
  name: varchar('name', { length: 200 }).notNull(),
  description: text('description').notNull(),
  fileName: varchar('file_name', { length: 255 }).notNull(),
  format: mysqlEnum('format', ENSEMBLE_FORMATS).notNull(),
  sha256: varchar('sha256', { length: 64 }).notNull(),
  sizeBytes: bigint('size_bytes', { mode: 'number', unsigned: true }).notNull(),
  objectKey: varchar('object_key', { length: 200 }).notNull(),
  d: int('d').notNull(),
  configurationCount: int('configuration_count').notNull(),
  pointCount: bigint('point_count', { mode: 'number', unsigned: true }).notNull(),
  setting: json('setting').$type<EnsembleSettingRecord>().notNull(),
  uploadedBy: varchar('uploaded_by', { length: 40 }).references(() => users.id, { onDelete: 'set null' }),
  revision: varchar('revision', { length: 40 }).notNull(),
  // A deterministic subsample of the first configuration, for the preview drawing.
  preview: json('preview').$type<{ d: number, points: number[][] }>(),
  ...timestamps,
}, t => [uniqueIndex('ensemble_companion_sha_unique').on(t.companionId, t.sha256), index('ensemble_companion_idx').on(t.companionId)])

/** What an ensemble declares: geometry, kernel, potential, β and the convention record. */
export interface EnsembleSettingRecord {
  geometry: { kind: 'free', d: 1 | 2 | 3 } | { kind: 'torus', d: 1 | 2 | 3, L: number } | { kind: 'sphere' }
  kernel: { name: 'log' } | { name: 'coulomb' } | { name: 'riesz', s: number }
  potential: string | null
  beta: number | null
  convention: { pairs: 'half' | 'full', fieldScale: 1 | 'N/2' | 'N', logSign: 'minus-log' | 'plus-log', gibbs: 'beta' | 'beta/2' | 'beta N^(2/d-1)/2' }
  labels: Record<string, string | number>
}

export const ensembleConfigurations = mysqlTable('ensemble_configuration', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  ensembleId: bigint('ensemble_id', { mode: 'number', unsigned: true }).notNull().references(() => ensembles.id, { onDelete: 'cascade' }),
  position: int('position').notNull(),
  n: int('n').notNull(),
  d: int('d').notNull(),
  checksum: varchar('checksum', { length: 64 }).notNull(),
  bbox: json('bbox').$type<{ min: number[], max: number[] }>().notNull(),
  minDistance: double('min_distance'),
  labels: json('labels').$type<Record<string, string | number>>().notNull(),
}, t => [uniqueIndex('configuration_position_unique').on(t.ensembleId, t.position)])

export const TOKEN_SCOPES = ['ensembles:read', 'ensembles:write'] as const

// Tokens for scripted access from a pipeline: shown once, stored as a SHA-256 hash, scoped to one companion.
export const apiTokens = mysqlTable('api_token', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  companionId: bigint('companion_id', { mode: 'number', unsigned: true }).notNull().references(() => companions.id, { onDelete: 'cascade' }),
  createdBy: varchar('created_by', { length: 40 }).notNull().references(() => users.id, { onDelete: 'cascade' }),
  name: varchar('name', { length: 120 }).notNull(),
  prefix: varchar('prefix', { length: 16 }).notNull(),
  tokenHash: varchar('token_hash', { length: 64 }).notNull(),
  scopes: json('scopes').$type<Array<typeof TOKEN_SCOPES[number]>>().notNull(),
  lastUsedAt: datetime('last_used_at'),
  revokedAt: datetime('revoked_at'),
  ...timestamps,
}, t => [uniqueIndex('api_token_hash_unique').on(t.tokenHash), index('api_token_companion_idx').on(t.companionId)])

export const COMPUTATION_STATUSES = ['queued', 'running', 'current', 'failed', 'cancelled'] as const

// A computation is a quantity of the engine evaluated over one or more ensembles with parameters.
// Its row is also its job: status, attempts, progress and heartbeat live here, so queued and
// running work survives a restart of the server.
export const computations = mysqlTable('computation', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  companionId: bigint('companion_id', { mode: 'number', unsigned: true }).notNull().references(() => companions.id, { onDelete: 'cascade' }),
  name: varchar('name', { length: 200 }).notNull(),
  quantity: varchar('quantity', { length: 60 }).notNull(),
  parameters: json('parameters').$type<Record<string, string | number | boolean>>().notNull(),
  ensembleIds: json('ensemble_ids').$type<number[]>().notNull(),
  status: mysqlEnum('status', COMPUTATION_STATUSES).notNull().default('queued'),
  inputHash: varchar('input_hash', { length: 64 }).notNull(),
  resultId: bigint('result_id', { mode: 'number', unsigned: true }),
  error: text('error'),
  progress: double('progress').notNull().default(0),
  progressNote: varchar('progress_note', { length: 200 }).notNull().default(''),
  attempts: int('attempts').notNull().default(0),
  // Values the authors declare (e.g. printed in the manuscript), compared with the recomputed ones.
  declared: json('declared').$type<DeclaredValues>(),
  createdBy: varchar('created_by', { length: 40 }).references(() => users.id, { onDelete: 'set null' }),
  startedAt: datetime('started_at'),
  finishedAt: datetime('finished_at'),
  heartbeatAt: datetime('heartbeat_at'),
  ...timestamps,
}, t => [index('computation_companion_idx').on(t.companionId), index('computation_status_idx').on(t.status)])

// Results by input hash (quantity, parameters, the ensembles' bytes and settings, engine version):
// identical inputs are computed once.
export const computationResults = mysqlTable('computation_result', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  inputHash: varchar('input_hash', { length: 64 }).notNull(),
  quantity: varchar('quantity', { length: 60 }).notNull(),
  engineVersion: varchar('engine_version', { length: 20 }).notNull(),
  table: json('result_table').$type<ComputationTable>().notNull(),
  createdAt: timestamp('created_at', { mode: 'date' }).notNull().default(sql`CURRENT_TIMESTAMP`),
}, t => [uniqueIndex('computation_result_hash_unique').on(t.inputHash)])

// A figure of a companion: numbered within it, drawn by one of our templates from the results of
// one or more computations.
export const figures = mysqlTable('figure', {
  id: bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey(),
  companionId: bigint('companion_id', { mode: 'number', unsigned: true }).notNull().references(() => companions.id, { onDelete: 'cascade' }),
  number: int('number').notNull(),
  title: varchar('title', { length: 300 }).notNull(),
  caption: text('caption').notNull(),
  template: varchar('template', { length: 60 }).notNull(),
  computationIds: json('computation_ids').$type<number[]>().notNull(),
  options: json('options').$type<Record<string, string | number | boolean>>().notNull(),
  // For the template 'custom': the author's Vega-Lite spec, whose data are named computation-<id>.
  customSpec: json('custom_spec').$type<Record<string, unknown>>(),
  createdBy: varchar('created_by', { length: 40 }).references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
}, t => [uniqueIndex('figure_number_unique').on(t.companionId, t.number)])

/** Declared values of one column, row by row, and the tolerance of the comparison. */
export interface DeclaredValues {
  column: string
  values: Array<number | null>
  relativeTolerance: number
  absoluteTolerance: number
  source: string
}

/** A computation's result: one row per configuration (or per bin) plus aggregates. */
export interface ComputationTable {
  quantity: string
  columns: Array<{ name: string, label: string }>
  rows: Array<Record<string, number | string | null>>
  aggregates: Record<string, number | string | null>
  convention: string
  engineVersion: string
  inputHash: string
  notes: string[]
}

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
