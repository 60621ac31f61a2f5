// The demo seed: an invented research group with one account per role and one draft companion.
// Idempotent (accounts and the companion are found by e-mail and slug). Refuses to run in production.
import { pathToFileURL } from 'node:url'
import { and, eq } from 'drizzle-orm'
import { drizzle } from 'drizzle-orm/mysql2'
import mysql from 'mysql2/promise'
import * as schema from '../server/db/schema'
import { hashPassword } from '../server/utils/password'
import { demoAccounts, demoCompanion } from './demo-data.mjs'

export async function seedDemo(url: string): Promise<void> {
  if (process.env.NUXT_DEPLOYMENT === 'production') {
    throw new Error('The demo seed never runs in production (NUXT_DEPLOYMENT=production).')
  }
  const pool = mysql.createPool({ uri: url, timezone: 'Z' })
  const db = drizzle(pool, { schema, mode: 'default' })
  try {
    const ids = new Map<string, string>()
    for (const account of demoAccounts) {
      const [existing] = await db.select({ id: schema.users.id }).from(schema.users).where(eq(schema.users.email, account.email)).limit(1)
      if (existing) {
        ids.set(account.email, existing.id)
        continue
      }
      await db.insert(schema.users).values({
        id: account.id,
        email: account.email,
        passwordHash: await hashPassword(account.password),
        displayName: account.displayName,
        affiliation: account.affiliation,
        siteRole: account.siteRole,
      })
      ids.set(account.email, account.id)
    }
    let [companion] = await db.select({ id: schema.companions.id }).from(schema.companions).where(eq(schema.companions.slug, demoCompanion.slug)).limit(1)
    if (!companion) {
      const [created] = await db.insert(schema.companions).values({
        slug: demoCompanion.slug,
        title: demoCompanion.title,
        abstract: demoCompanion.abstract,
        manuscriptRef: demoCompanion.manuscriptRef,
        createdBy: ids.get(demoCompanion.members[0]!.email),
      }).$returningId()
      companion = created
    }
    if (!companion) throw new Error('the demo companion was not stored')
    let reviewers = 0
    for (const member of demoCompanion.members) {
      const userId = ids.get(member.email)!
      // Reviewers are numbered in the order they joined, as the application does.
      const reviewerNumber = member.role === 'reviewer' ? ++reviewers : null
      const [row] = await db.select({ id: schema.memberships.id }).from(schema.memberships)
        .where(and(eq(schema.memberships.companionId, companion.id), eq(schema.memberships.userId, userId))).limit(1)
      if (!row) await db.insert(schema.memberships).values({ companionId: companion.id, userId, role: member.role, reviewerNumber })
    }
  }
  finally {
    await pool.end()
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const url = process.env.NUXT_DATABASE_URL
  if (!url) {
    console.error('[quillfield] set NUXT_DATABASE_URL (npm start does this for you)')
    process.exit(2)
  }
  seedDemo(url).then(() => console.log('[quillfield] demo seed applied')).catch((error: unknown) => {
    console.error(`[quillfield] demo seed failed: ${error instanceof Error ? error.message : String(error)}`)
    process.exit(1)
  })
}
