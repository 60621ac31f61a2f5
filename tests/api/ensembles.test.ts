// Ensembles end to end against the real MariaDB, the object-store fake and the companion's git
// repository: uploads, duplicates, revisions, tokens, downloads and the archive re-verified with
// the engine's command line.
import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join } from 'node:path'
import { unzipSync } from 'fflate'
import { beforeAll, describe, expect, it } from 'vitest'
import { nodeIO, runEngine } from '../../cli/engine'
import { ApiClient, planeSetting, signUp, uniqueCsv, uniqueName } from '../support/http'
import type { TestAccount } from '../support/http'

let author: TestAccount
let slug = ''

interface Stored { id: number, revision: string, preview: { d: number, points: number[][] } }

beforeAll(async () => {
  author = await signUp('ens-author')
  slug = uniqueName('ens-')
  const created = await author.client.post('/api/companions', { title: 'Ensemble tests', slug })
  expect(created.status).toBe(201)
})

describe('uploading ensembles', () => {
  it('stores a CSV, lists it, and answers with a preview of the first configuration', async () => {
    const csv = 'x,y\n0.1,0.2\n-0.3,0.4\n0.5,-0.6\n'
    const reply = await author.client.upload<Stored>(`/api/companions/${slug}/ensembles`, planeSetting('three points'), 'three.csv', csv)
    expect(reply.status).toBe(201)
    expect(reply.body.revision).toMatch(/^[0-9a-f]{40}$/)
    expect(reply.body.preview.points).toEqual([[0.1, 0.2], [-0.3, 0.4], [0.5, -0.6]])
    const list = await author.client.get<{ ensembles: Array<{ id: number, configurationCount: number, pointCount: number, format: string }> }>(`/api/companions/${slug}/ensembles`)
    expect(list.body.ensembles.find(e => e.id === reply.body.id)).toMatchObject({ configurationCount: 1, pointCount: 3, format: 'text' })
    const one = await author.client.get<{ configurations: Array<{ n: number, d: number, checksum: string, minDistance: number }> }>(`/api/companions/${slug}/ensembles/${reply.body.id}`)
    expect(one.body.configurations).toHaveLength(1)
    expect(one.body.configurations[0]).toMatchObject({ n: 3, d: 2 })
    // The closest pair is (−0.3, 0.4)–(0.1, 0.2): distance √(0.16 + 0.04).
    expect(one.body.configurations[0]!.minDistance).toBeCloseTo(Math.sqrt(0.2), 12)
  })

  it('recognises a second upload of the same bytes', async () => {
    const csv = uniqueCsv()
    const first = await author.client.upload(`/api/companions/${slug}/ensembles`, planeSetting('original'), 'a.csv', csv)
    expect(first.status).toBe(201)
    const again = await author.client.upload<{ message: string }>(`/api/companions/${slug}/ensembles`, planeSetting('copy'), 'b.csv', csv)
    expect(again.status).toBe(409)
    // The full text (with its non-ASCII quotes) is in `message`; the HTTP status line carries only ASCII.
    expect(again.body.message).toContain('already stored here as ensemble «original»')
  })

  it('refuses a setting that does not hold together, field by field', async () => {
    const reply = await author.client.upload<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/ensembles`,
      { name: '', geometry: { kind: 'free', d: 2 }, kernel: { name: 'coulomb' }, potential: null }, 'x.csv', uniqueCsv())
    expect(reply.status).toBe(422)
    expect(Object.keys(reply.body.data.fields).sort()).toEqual(['kernel', 'name', 'potential'])
  })

  it('says where a bad potential expression goes wrong', async () => {
    const reply = await author.client.upload<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/ensembles`,
      { ...planeSetting('bad V'), potential: 'r^2 + import(x)' }, 'x.csv', uniqueCsv())
    expect(reply.status).toBe(422)
    expect(reply.body.data.fields.potential).toMatch(/character/)
  })
})

describe('revisions', () => {
  it('changes a convention, shows the change in a diff, and restores the earlier revision', async () => {
    const stored = await author.client.upload<Stored>(`/api/companions/${slug}/ensembles`, planeSetting('round trip'), 'rt.csv', uniqueCsv())
    expect(stored.status).toBe(201)
    const changed = await author.client.patch<{ revision: string }>(`/api/companions/${slug}/ensembles/${stored.body.id}`, { convention: { pairs: 'half', fieldScale: 1, logSign: 'minus-log', gibbs: 'beta' } })
    expect(changed.status).toBe(200)
    const diff = await author.client.get<{ diff: { lines: string[] } }>(`/api/companions/${slug}/revisions/diff?from=${stored.body.revision}&to=${changed.body.revision}`)
    expect(diff.status).toBe(200)
    expect(diff.body.diff.lines.join('\n')).toMatch(/pairs/)
    expect(diff.body.diff.lines.join('\n')).toMatch(/full/)

    const history = await author.client.get<{ revisions: Array<{ oid: string, message: string, author: { email: string } }> }>(`/api/companions/${slug}/revisions`)
    expect(history.body.revisions[0]!.oid).toBe(changed.body.revision)
    expect(history.body.revisions[0]!.author.email).toBe(author.email)
    expect(history.body.revisions.at(-1)!.message).toBe('Companion opened')

    const restored = await author.client.post<{ revision: string }>(`/api/companions/${slug}/revisions/${stored.body.revision}/restore`)
    expect(restored.status).toBe(200)
    const after = await author.client.get<{ ensemble: { setting: { convention: { pairs: string } } } }>(`/api/companions/${slug}/ensembles/${stored.body.id}`)
    expect(after.body.ensemble.setting.convention.pairs).toBe('full')
    const latest = await author.client.get<{ revisions: Array<{ message: string }> }>(`/api/companions/${slug}/revisions`)
    expect(latest.body.revisions[0]!.message).toContain(`Restore revision ${stored.body.revision.slice(0, 8)}`)
  })
})

describe('API tokens', () => {
  it('uploads with a token, is limited to its companion and scope, and stops working once revoked', async () => {
    const made = await author.client.post<{ token: { id: number, token: string } }>(`/api/companions/${slug}/tokens`, { name: 'pipeline', scopes: ['ensembles:read', 'ensembles:write'] })
    expect(made.status).toBe(201)
    const { token, id } = made.body.token
    expect(token).toMatch(/^qft_/)
    const robot = new ApiClient()
    const upload = await robot.upload(`/api/companions/${slug}/ensembles`, planeSetting('from a pipeline'), 'robot.csv', uniqueCsv(), { bearer: token })
    expect(upload.status).toBe(201)

    const asRobot = async (method: string, path: string, body?: unknown) =>
      (await fetch(`${process.env.QF_BASE_URL}${path}`, { method, headers: { 'authorization': `Bearer ${token}`, 'content-type': 'application/json' }, body: body ? JSON.stringify(body) : undefined })).status
    expect(await asRobot('GET', `/api/companions/${slug}/ensembles`)).toBe(200)
    expect(await asRobot('POST', '/api/companions', { title: 'Not with a token', slug: uniqueName('tok-') })).toBe(403)
    expect(await asRobot('GET', `/api/companions/${slug}/members`)).toBe(403)
    const other = await signUp('other-comp')
    const otherSlug = uniqueName('tok-other-')
    await other.client.post('/api/companions', { title: 'Another companion', slug: otherSlug })
    expect(await asRobot('GET', `/api/companions/${otherSlug}/ensembles`)).toBe(404)

    const tokens = await author.client.get<{ tokens: Array<{ id: number, lastUsedAt: string | null }> }>(`/api/companions/${slug}/tokens`)
    expect(tokens.body.tokens.find(t => t.id === id)!.lastUsedAt).not.toBeNull()
    expect((await author.client.delete(`/api/companions/${slug}/tokens/${id}`)).status).toBe(204)
    expect(await asRobot('GET', `/api/companions/${slug}/ensembles`)).toBe(401)
  })

  it('refuses a token that only reads when it tries to upload', async () => {
    const made = await author.client.post<{ token: { token: string } }>(`/api/companions/${slug}/tokens`, { name: 'reader', scopes: ['ensembles:read'] })
    const reply = await new ApiClient().upload(`/api/companions/${slug}/ensembles`, planeSetting('nope'), 'nope.csv', uniqueCsv(), { bearer: made.body.token.token })
    expect(reply.status).toBe(403)
  })
})

describe('downloads', () => {
  it('serves a configuration in every format with the same points', async () => {
    const csv = 'x,y\n0.25,0.5\n-0.75,0.125\n'
    const stored = await author.client.upload<Stored>(`/api/companions/${slug}/ensembles`, planeSetting('formats'), 'formats.csv', csv)
    const base = `${process.env.QF_BASE_URL}/files/${slug}/ensembles/${stored.body.id}`
    const get = (q: string) => fetch(`${base}?${q}`, { headers: { cookie: author.client.cookie } })
    const original = await get('format=original')
    expect(original.status).toBe(200)
    expect(await original.text()).toBe(csv)
    const asJson = await (await get('format=json')).json() as { configurations: Array<{ points: number[][] }> }
    expect(asJson.configurations[0]!.points).toEqual([[0.25, 0.5], [-0.75, 0.125]])
    const npy = new Uint8Array(await (await get('format=npy')).arrayBuffer())
    // NPY magic \x93NUMPY (NumPy Enhancement Proposal 1) and the two float64 coordinates of the first point.
    expect(Array.from(npy.slice(0, 6))).toEqual([0x93, 0x4E, 0x55, 0x4D, 0x50, 0x59])
    const headerLength = npy[8]! + 256 * npy[9]!
    const values = new Float64Array(npy.slice(10 + headerLength).buffer)
    expect(Array.from(values)).toEqual([0.25, 0.5, -0.75, 0.125])
    const csvOut = await (await get('format=csv')).text()
    expect(csvOut.trim().split('\n').slice(1)).toEqual(['0.25,0.5', '-0.75,0.125'])
  })

  it('exports the whole companion as an archive that the command line re-verifies', async () => {
    const response = await fetch(`${process.env.QF_BASE_URL}/files/${slug}/archive`, { headers: { cookie: author.client.cookie } })
    expect(response.status).toBe(200)
    expect(response.headers.get('content-type')).toBe('application/zip')
    const files = unzipSync(new Uint8Array(await response.arrayBuffer()))
    expect(Object.keys(files)).toEqual(expect.arrayContaining(['manifest.json', 'README.md', 'SHA256SUMS']))
    const dir = mkdtempSync(join(tmpdir(), 'qf-archive-'))
    for (const [name, bytes] of Object.entries(files)) {
      mkdirSync(dirname(join(dir, name)), { recursive: true })
      writeFileSync(join(dir, name), bytes)
    }
    // Every line of SHA256SUMS matches the bytes it names (FIPS 180-4 SHA-256 via WebCrypto).
    const sums = new TextDecoder().decode(files['SHA256SUMS']).trim().split('\n')
    for (const line of sums) {
      const [hash, name] = line.split(/\s+/)
      const digest = Buffer.from(await crypto.subtle.digest('SHA-256', files[name!]!)).toString('hex')
      expect(digest, name).toBe(hash)
    }
    const verified = await runEngine(['verify', '--manifest', join(dir, 'manifest.json')], nodeIO)
    expect(verified.stderr).toBe('')
    expect(verified.code).toBe(0)
    const report = JSON.parse(verified.stdout) as { verified: boolean, ensembles: unknown[] }
    expect(report.verified).toBe(true)
    expect(report.ensembles.length).toBeGreaterThan(3)

    // Tampering with one data file is caught.
    const dataFile = Object.keys(files).find(n => n.startsWith('data/') && n.endsWith('.csv'))!
    writeFileSync(join(dir, dataFile), `${new TextDecoder().decode(files[dataFile]).trim()}\n0.123,0.456\n`)
    const tampered = await runEngine(['verify', '--manifest', join(dir, 'manifest.json')], nodeIO)
    expect(tampered.code).toBe(1)
    expect(tampered.stderr).toContain('SHA-256')
  })
})
