// Applies the Drizzle migrations in drizzle/ to the database at NUXT_DATABASE_URL (or the default one).
import { drizzle } from 'drizzle-orm/mysql2'
import { migrate } from 'drizzle-orm/mysql2/migrator'
import mysql from 'mysql2/promise'
import { join } from 'node:path'
import { databaseUrl, root } from './lib/config.mjs'
import { log } from './lib/run.mjs'

export async function applyMigrations(url = process.env.NUXT_DATABASE_URL ?? databaseUrl()) {
  const connection = await mysql.createConnection({ uri: url, multipleStatements: true })
  try {
    await migrate(drizzle(connection), { migrationsFolder: join(root, 'drizzle') })
    const [rows] = await connection.query('SELECT COUNT(*) AS n FROM __drizzle_migrations')
    log(`migrations applied: ${rows[0].n} (${new URL(url).pathname.slice(1)})`)
  }
  finally {
    await connection.end()
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  await applyMigrations().catch((error) => {
    console.error(`[quillfield] migration failed: ${error.message}`)
    process.exit(1)
  })
}
