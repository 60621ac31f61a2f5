// A small HTTP client for the API tests: keeps its session cookie, sends the site's Origin
// (as a browser would) and a client address of its own (the test server trusts X-Forwarded-For).
import mysql from 'mysql2/promise'

export const baseUrl = process.env.QF_BASE_URL ?? 'http://127.0.0.1:3100'

let addressCounter = 10

export interface Reply<T = unknown> {
  status: number
  body: T
  headers: Headers
}

export class ApiClient {
  cookie = ''
  readonly address: string

  constructor(address?: string) {
    this.address = address ?? `10.77.${Math.floor(addressCounter / 250)}.${(addressCounter++ % 250) + 1}`
  }

  async request<T = Record<string, unknown>>(method: string, path: string, body?: unknown, options: { keepCookie?: boolean, origin?: string | null } = {}): Promise<Reply<T>> {
    const headers: Record<string, string> = { 'x-forwarded-for': this.address, 'accept': 'application/json' }
    if (options.origin !== null) headers.origin = options.origin ?? baseUrl
    if (this.cookie) headers.cookie = this.cookie
    if (body !== undefined) headers['content-type'] = 'application/json'
    const response = await fetch(`${baseUrl}${path}`, { method, headers, body: body === undefined ? undefined : JSON.stringify(body), redirect: 'manual' })
    if (options.keepCookie !== false) {
      for (const line of response.headers.getSetCookie()) {
        const [pair] = line.split(';')
        if (pair?.startsWith('qf_session=')) this.cookie = pair.endsWith('=') ? '' : pair
      }
    }
    const text = await response.text()
    let parsed: unknown = text
    try {
      parsed = text ? JSON.parse(text) : null
    }
    catch { /* not JSON */ }
    return { status: response.status, body: parsed as T, headers: response.headers }
  }

  /** Sends a multipart upload (a "setting" JSON part and a "file" part), as the upload form does. */
  async upload<T = Record<string, unknown>>(path: string, setting: unknown, fileName: string, bytes: Uint8Array | string, options: { bearer?: string } = {}): Promise<Reply<T>> {
    const form = new FormData()
    form.append('setting', JSON.stringify(setting))
    form.append('file', new Blob([typeof bytes === 'string' ? new TextEncoder().encode(bytes) : bytes]), fileName)
    const headers: Record<string, string> = { 'x-forwarded-for': this.address, 'origin': baseUrl }
    if (this.cookie) headers.cookie = this.cookie
    if (options.bearer) headers.authorization = `Bearer ${options.bearer}`
    const response = await fetch(`${baseUrl}${path}`, { method: 'POST', headers, body: form })
    const text = await response.text()
    let parsed: unknown = text
    try {
      parsed = text ? JSON.parse(text) : null
    }
    catch { /* not JSON */ }
    return { status: response.status, body: parsed as T, headers: response.headers }
  }

  get<T = Record<string, unknown>>(path: string) {
    return this.request<T>('GET', path)
  }

  post<T = Record<string, unknown>>(path: string, body?: unknown) {
    return this.request<T>('POST', path, body ?? {})
  }

  patch<T = Record<string, unknown>>(path: string, body: unknown) {
    return this.request<T>('PATCH', path, body)
  }

  delete<T = Record<string, unknown>>(path: string) {
    return this.request<T>('DELETE', path)
  }
}

let unique = 0
export function uniqueName(prefix: string): string {
  return `${prefix}${Date.now().toString(36)}${(unique++).toString(36)}`
}

export interface TestAccount {
  client: ApiClient
  email: string
  password: string
  id: string
}

/** Makes a fresh account through the API and returns a client signed in as it. */
export async function signUp(prefix = 'person'): Promise<TestAccount> {
  const client = new ApiClient()
  const email = `${uniqueName(prefix)}@tests.example`
  const password = 'a long enough password'
  const reply = await client.post('/api/auth/sign-up', { email, password, displayName: `Test ${prefix}` })
  if (reply.status !== 201) throw new Error(`sign-up failed: ${reply.status} ${JSON.stringify(reply.body)}`)
  const me = await client.get<{ account: { id: string } }>('/api/auth/session')
  return { client, email, password, id: me.body.account.id }
}

/** Direct access to the test database, for what no route does (e.g. making an administrator). */
export async function withDatabase<T>(fn: (connection: mysql.Connection) => Promise<T>): Promise<T> {
  const url = process.env.NUXT_DATABASE_URL
  if (!url) throw new Error('NUXT_DATABASE_URL is not set; run the API tests through npm test')
  const connection = await mysql.createConnection({ uri: url })
  try {
    return await fn(connection)
  }
  finally {
    await connection.end()
  }
}

/** A setting for 2-D points in free space with V = |x|², in the canonical convention. */
export function planeSetting(name: string) {
  return { name, geometry: { kind: 'free', d: 2 }, kernel: { name: 'log' }, potential: 'r^2', beta: 2 }
}

/** A small CSV of 2-D points, different for every call (so uploads are never duplicates). */
let csvCounter = 0
export function uniqueCsv(points = 5): string {
  const shift = ++csvCounter * 1e-6 + Math.random() * 1e-3
  const rows = ['x,y']
  for (let i = 0; i < points; i++) rows.push(`${(Math.cos(i * 2.1) * 0.5 + shift).toPrecision(15)},${(Math.sin(i * 2.1) * 0.5).toPrecision(15)}`)
  return `${rows.join('\n')}\n`
}

export async function makeAdmin(account: TestAccount): Promise<void> {
  await withDatabase(c => c.query('UPDATE user SET site_role = ? WHERE id = ?', ['admin', account.id]))
}
