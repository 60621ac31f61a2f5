// The migration level: what the database has applied against what this build ships.
import journal from '../../drizzle/meta/_journal.json'

export interface MigrationLevel {
  applied: number
  expected: number
  latest: string | null
  current: boolean
}

export async function migrationLevel(): Promise<MigrationLevel> {
  const [rows] = await useDB().execute(sql`SELECT COUNT(*) AS n FROM __drizzle_migrations`) as unknown as [Array<{ n: number | string }>]
  const applied = Number(rows[0]?.n ?? 0)
  const expected = journal.entries.length
  const latest = journal.entries[applied - 1]?.tag ?? null
  return { applied, expected, latest, current: applied === expected }
}
