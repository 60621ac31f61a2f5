// One Drizzle client over a mysql2 pool, created on first use.
import { drizzle } from 'drizzle-orm/mysql2'
import type { MySql2Database } from 'drizzle-orm/mysql2'
import mysql from 'mysql2/promise'
import * as schema from '../db/schema'

export { and, asc, count, desc, eq, gt, inArray, isNull, like, lt, ne, or, sql } from 'drizzle-orm'
export const tables = schema

export type AppDatabase = MySql2Database<typeof schema>

let pool: mysql.Pool | undefined
let db: AppDatabase | undefined

export function useDB(): AppDatabase {
  if (!db) {
    pool = mysql.createPool({
      uri: useRuntimeConfig().databaseUrl,
      connectionLimit: 10,
      timezone: 'Z',
      enableKeepAlive: true,
    })
    db = drizzle(pool, { schema, mode: 'default' })
  }
  return db
}

/** Closes the pool (used on shutdown). */
export async function closeDB(): Promise<void> {
  await pool?.end()
  pool = undefined
  db = undefined
}
