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

/** Object storage: the local fake unless QF_S3_ENDPOINT points at a real S3 endpoint. */
export const objectStore = {
  local: !process.env.QF_S3_ENDPOINT,
  port: Number(process.env.QF_S3_PORT ?? 3309),
  bucket: process.env.QF_S3_BUCKET ?? 'quillfield',
  testBucket: process.env.QF_S3_TEST_BUCKET ?? 'quillfield-test',
  endpoint: process.env.QF_S3_ENDPOINT ?? `http://127.0.0.1:${Number(process.env.QF_S3_PORT ?? 3309)}`,
}

/** E-mail: the local SMTP fake unless QF_SMTP_HOST names a real server. */
export const mail = {
  local: !process.env.QF_SMTP_HOST,
  port: Number(process.env.QF_SMTP_PORT ?? 3311),
  inboxPort: Number(process.env.QF_SMTP_INBOX_PORT ?? (Number(process.env.QF_SMTP_PORT ?? 3311) + 1)),
  host: process.env.QF_SMTP_HOST ?? '127.0.0.1',
}

/** Environment for the application: where its services are. */
export function serviceEnvironment({ test = false } = {}) {
  return {
    NUXT_DATABASE_URL: databaseUrl(test ? db.testName : db.name),
    NUXT_S3_ENDPOINT: objectStore.endpoint,
    NUXT_S3_BUCKET: test ? objectStore.testBucket : objectStore.bucket,
    NUXT_S3_ACCESS_KEY_ID: process.env.QF_S3_ACCESS_KEY_ID ?? 'S3RVER',
    NUXT_S3_SECRET_ACCESS_KEY: process.env.QF_S3_SECRET_ACCESS_KEY ?? 'S3RVER',
    NUXT_DATA_PATH: join(dataDir, test ? 'app-test' : 'app'),
    NUXT_SMTP_HOST: mail.host,
    NUXT_SMTP_PORT: String(process.env.QF_SMTP_HOST ? Number(process.env.QF_SMTP_PORT ?? 587) : mail.port),
    ...(mail.local ? { NUXT_MAIL_INBOX_URL: `http://127.0.0.1:${mail.inboxPort}` } : {}),
  }
}

export const app = {
  host: process.env.QF_HOST ?? '127.0.0.1',
  port: Number(process.env.QF_PORT ?? 3000),
  testPort: Number(process.env.QF_TEST_PORT ?? 3100),
}
