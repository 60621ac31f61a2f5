// Settings shared by the project's scripts. Every value can be changed by an environment variable.
import { existsSync, readFileSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'

export const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..')
export const dataDir = process.env.QF_DATA_DIR ?? join(root, '.data')

/** Reads KEY=VALUE lines from .env (if present) into process.env without overriding. */
export function loadDotEnv() {
  const file = join(root, '.env')
  if (!existsSync(file)) return
  for (const line of readFileSync(file, 'utf8').split('\n')) {
    const match = /^\s*([A-Z0-9_]+)\s*=\s*(.*?)\s*$/.exec(line)
    if (match && !line.trimStart().startsWith('#') && process.env[match[1]] === undefined) {
      process.env[match[1]] = match[2].replace(/^(['"])(.*)\1$/, '$2')
    }
  }
}

loadDotEnv()

export const db = {
  host: '127.0.0.1',
  port: Number(process.env.QF_DB_PORT ?? 3307),
  user: process.env.QF_DB_USER ?? 'quillfield',
  password: process.env.QF_DB_PASSWORD ?? 'quillfield',
  name: process.env.QF_DB_NAME ?? 'quillfield',
  testName: process.env.QF_DB_TEST_NAME ?? 'quillfield_test',
}

export function databaseUrl(name = db.name) {
  return `mysql://${encodeURIComponent(db.user)}:${encodeURIComponent(db.password)}@${db.host}:${db.port}/${name}`
}

export const app = {
  host: process.env.QF_HOST ?? '127.0.0.1',
  port: Number(process.env.QF_PORT ?? 3000),
  testPort: Number(process.env.QF_TEST_PORT ?? 3100),
}
