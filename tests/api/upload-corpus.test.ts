// Every good fixture uploads end to end (real MariaDB, the object-store fake, the companion's git
// repository); every malformed fixture is refused with its precise message and location and leaves
// no row, no object and no revision behind. The fixtures and their expected errors are written by
// tests/fixtures/make-fixtures.ts.
import { readFileSync, readdirSync } from 'node:fs'
import { join } from 'node:path'
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3'
import { beforeAll, describe, expect, it } from 'vitest'
import { signUp, uniqueName } from '../support/http'
import type { TestAccount } from '../support/http'

const fixtures = join(process.cwd(), 'tests', 'fixtures')
const expected = JSON.parse(readFileSync(join(fixtures, 'malformed', 'expected.json'), 'utf8')) as Record<string, {
  geometry: { kind: string, d?: number, L?: number }
  message: string
  where: Record<string, unknown>
  options?: Record<string, unknown>
}>

let author: TestAccount
let slug = ''

function settingFor(geometry: { kind: string, d?: number, L?: number }, name: string) {
  return {
    name,
    geometry,
    kernel: { name: geometry.kind === 'free' && geometry.d === 3 ? 'coulomb' : 'log' },
    potential: geometry.kind === 'free' ? 'r^2' : null,
  }
}

async function objectCount(): Promise<number> {
  const client = new S3Client({
    endpoint: process.env.NUXT_S3_ENDPOINT,
    region: 'us-east-1',
    forcePathStyle: true,
    credentials: { accessKeyId: process.env.NUXT_S3_ACCESS_KEY_ID ?? 'S3RVER', secretAccessKey: process.env.NUXT_S3_SECRET_ACCESS_KEY ?? 'S3RVER' },
  })
  let n = 0
  let token: string | undefined
  do {
    const page = await client.send(new ListObjectsV2Command({ Bucket: process.env.NUXT_S3_BUCKET, ContinuationToken: token }))
    n += page.KeyCount ?? 0
    token = page.NextContinuationToken
  } while (token)
  client.destroy()
  return n
}

async function counts() {
  const ensembles = await author.client.get<{ ensembles: unknown[] }>(`/api/companions/${slug}/ensembles`)
  const revisions = await author.client.get<{ revisions: unknown[] }>(`/api/companions/${slug}/revisions`)
  return { ensembles: ensembles.body.ensembles.length, revisions: revisions.body.revisions.length, objects: await objectCount() }
}

beforeAll(async () => {
  author = await signUp('corpus')
  slug = uniqueName('corpus-')
  await author.client.post('/api/companions', { title: 'Fixture corpus', slug })
})

describe('good files of every format', () => {
  const geometryOf = (name: string) => name.startsWith('sphere') ? { kind: 'sphere' } : name.startsWith('torus') ? { kind: 'torus', d: 2, L: 1 } : { kind: 'free', d: 2 }
  const checksums = new Map<string, string[]>()

  for (const name of readdirSync(join(fixtures, 'good')).sort()) {
    it(`stores ${name}`, async () => {
      const bytes = new Uint8Array(readFileSync(join(fixtures, 'good', name)))
      const reply = await author.client.upload<{ id: number }>(`/api/companions/${slug}/ensembles`, settingFor(geometryOf(name), name), name, bytes)
      expect(reply.status, JSON.stringify(reply.body)).toBe(201)
      const one = await author.client.get<{ ensemble: { sha256: string, format: string }, configurations: Array<{ n: number, d: number, checksum: string }> }>(`/api/companions/${slug}/ensembles/${reply.body.id}`)
      expect(one.body.configurations.length).toBeGreaterThan(0)
      const digest = Buffer.from(await crypto.subtle.digest('SHA-256', bytes)).toString('hex')
      expect(one.body.ensemble.sha256).toBe(digest)
      expect(one.body.ensemble.format).toBe(name.endsWith('.zip') ? 'zip' : name.endsWith('.npy') ? 'npy' : name.endsWith('.json') ? 'json' : 'text')
      const group = name.split('-')[0]!
      checksums.set(`${group}:${name}`, one.body.configurations.map(c => c.checksum))
    })
  }

  it('gives the same configuration checksums for the same points in every format', () => {
    for (const group of ['points', 'configs']) {
      const lists = [...checksums.entries()].filter(([k]) => k.startsWith(`${group}:`)).map(([, v]) => v)
      expect(lists.length).toBeGreaterThanOrEqual(4)
      for (const list of lists) expect(list).toEqual(lists[0])
    }
  })
})

describe('malformed files', () => {
  const names = Object.keys(expected).filter(name => !expected[name]!.options).sort()
  let before: Awaited<ReturnType<typeof counts>>

  beforeAll(async () => {
    before = await counts()
  })

  it('has a corpus of at least 30 files', () => {
    expect(names.length).toBeGreaterThanOrEqual(30)
  })

  for (const name of names) {
    it(`refuses ${name} saying what and where`, async () => {
      const e = expected[name]!
      const bytes = new Uint8Array(readFileSync(join(fixtures, 'malformed', name)))
      const reply = await author.client.upload<{ message: string, data: { where: Record<string, unknown> } }>(`/api/companions/${slug}/ensembles`, settingFor(e.geometry, name), name, bytes)
      expect(reply.status).toBe(422)
      expect(reply.body.message).toContain(e.message)
      expect(reply.body.data.where).toMatchObject(e.where)
    })
  }

  it('left no row, no stored object and no revision behind', async () => {
    expect(await counts()).toEqual(before)
  })
})
