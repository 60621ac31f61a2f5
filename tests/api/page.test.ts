// The companion page over HTTP: saving makes a revision holding page.md, reading gives the rendered
// blocks, bad text is refused field by field and stores nothing, and only authors and editors write.
import { beforeAll, describe, expect, it } from 'vitest'
import { createHash } from 'node:crypto'
import { unzipSync, strFromU8 } from 'fflate'
import { baseUrl, planeSetting, signUp, uniqueCsv, uniqueName, withDatabase } from '../support/http'
import type { TestAccount } from '../support/http'

let author: TestAccount
let reader: TestAccount
let slug = ''
let computationId = 0

interface PageReply {
  text: string
  blocks: Array<{ kind: string, html?: string, number?: number, computationId?: number }>
  problems: Array<{ line: number, message: string }>
  figures: Array<{ number: number, title: string, status: { word: string } }>
  computations: Array<{ id: number, name: string }>
  revision: string | null
}
interface RevisionsReply { revisions: Array<{ oid: string, message: string }> }

beforeAll(async () => {
  author = await signUp('page-author')
  reader = await signUp('page-reader')
  slug = uniqueName('page-')
  expect((await author.client.post('/api/companions', { title: 'Page tests', slug })).status).toBe(201)
  expect((await author.client.post(`/api/companions/${slug}/members`, { email: reader.email, role: 'reader' })).status).toBe(201)
  const up = await author.client.upload<{ id: number }>(`/api/companions/${slug}/ensembles`, planeSetting('plane'), 'plane.csv', uniqueCsv())
  expect(up.status).toBe(201)
  const made = await author.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'energy of the plane', quantity: 'energy', ensembleIds: [up.body.id], parameters: {} })
  expect(made.status).toBe(201)
  computationId = made.body.id
  const figure = await author.client.post(`/api/companions/${slug}/figures`, { title: 'Energy against N', template: 'energy-expansion', computationIds: [computationId] })
  expect(figure.status).toBe(201)
})

describe('the companion page', () => {
  it('starts empty', async () => {
    const reply = await reader.client.get<PageReply>(`/api/companions/${slug}/page`)
    expect(reply.status).toBe(200)
    expect(reply.body.text).toBe('')
    expect(reply.body.blocks).toEqual([])
  })

  it('saves the text as a new revision that the history lists and the page returns', async () => {
    const before = await author.client.get<RevisionsReply>(`/api/companions/${slug}/revisions`)
    const text = `# Energies\n\nThe log-gas energy $H_N = -\\sum_{i<j}\\log|x_i-x_j|$.\n\n@figure 1\n\n@table ${computationId} rows=3\n`
    const saved = await author.client.request<{ revision: string, changed: boolean }>('PUT', `/api/companions/${slug}/page`, { text, message: 'Describe the energies' })
    expect(saved.status).toBe(200)
    expect(saved.body.changed).toBe(true)
    expect(saved.body.revision).toMatch(/^[0-9a-f]{40}$/)
    const after = await author.client.get<RevisionsReply>(`/api/companions/${slug}/revisions`)
    expect(after.body.revisions).toHaveLength(before.body.revisions.length + 1)
    expect(after.body.revisions[0]).toMatchObject({ oid: saved.body.revision, message: 'Describe the energies' })
    const events = await withDatabase(async (c) => {
      const [rows] = await c.query('SELECT e.kind, e.actor_id AS actor FROM companion_event e JOIN companion k ON k.id = e.companion_id WHERE k.slug = ? AND e.revision = ?', [slug, saved.body.revision])
      return rows as Array<{ kind: string, actor: string }>
    })
    expect(events).toEqual([{ kind: 'page', actor: author.id }])

    const page = await reader.client.get<PageReply>(`/api/companions/${slug}/page`)
    expect(page.body.text).toBe(text)
    expect(page.body.revision).toBe(saved.body.revision)
    expect(page.body.problems).toEqual([])
    expect(page.body.blocks.map(b => b.kind)).toEqual(['html', 'figure', 'table'])
    expect(page.body.blocks[0]!.html).toContain('class="katex"')
    expect(page.body.blocks[0]!.html).toContain('<h1 id="pg-energies">Energies</h1>')
    expect(page.body.figures).toMatchObject([{ number: 1, title: 'Energy against N' }])
    expect(page.body.computations).toMatchObject([{ id: computationId, name: 'energy of the plane' }])
  })

  it('puts page.md into the companion archive of that revision', async () => {
    const page = await reader.client.get<PageReply>(`/api/companions/${slug}/page`)
    const response = await fetch(`${baseUrl}/files/${slug}/archive?revision=${page.body.revision}`, { headers: { 'cookie': reader.client.cookie, 'origin': baseUrl, 'x-forwarded-for': reader.client.address } })
    expect(response.status).toBe(200)
    const files = unzipSync(new Uint8Array(await response.arrayBuffer()))
    expect(strFromU8(files['page.md']!)).toBe(page.body.text)
    expect(strFromU8(files.SHA256SUMS!)).toMatch(/ {2}page\.md$/m)
  })

  it('saving the same text again makes no revision', async () => {
    const page = await author.client.get<PageReply>(`/api/companions/${slug}/page`)
    const again = await author.client.request<{ revision: string, changed: boolean }>('PUT', `/api/companions/${slug}/page`, { text: page.body.text })
    expect(again.status).toBe(200)
    expect(again.body).toMatchObject({ revision: page.body.revision, changed: false })
    const events = await withDatabase(async (c) => {
      const [rows] = await c.query('SELECT COUNT(*) AS n FROM companion_event e JOIN companion k ON k.id = e.companion_id WHERE k.slug = ? AND e.kind = ?', [slug, 'page'])
      return Number((rows as Array<{ n: number }>)[0]!.n)
    })
    expect(events).toBe(1)
  })

  it('refuses text over 200 000 characters with a message on the text field, storing nothing', async () => {
    const before = await author.client.get<PageReply>(`/api/companions/${slug}/page`)
    const reply = await author.client.request<{ data: { fields: Record<string, string> } }>('PUT', `/api/companions/${slug}/page`, { text: 'x'.repeat(200_001) })
    expect(reply.status).toBe(422)
    expect(reply.body.data.fields.text).toMatch(/200,000 characters/)
    const after = await author.client.get<PageReply>(`/api/companions/${slug}/page`)
    expect(after.body).toMatchObject({ text: before.body.text, revision: before.body.revision })
  })

  it('refuses a directive naming a figure the companion does not have, with its line', async () => {
    const before = await author.client.get<PageReply>(`/api/companions/${slug}/page`)
    const reply = await author.client.request<{ message: string, data: { fields: Record<string, string> } }>('PUT', `/api/companions/${slug}/page`, { text: 'Intro.\n\n@figure 1\n\n@figure 9\n' })
    expect(reply.status).toBe(422)
    expect(reply.body.message).toContain('Line 5')
    expect(reply.body.message).toContain('figure 9')
    expect(reply.body.data.fields.text).toContain('Line 5')
    const after = await author.client.get<PageReply>(`/api/companions/${slug}/page`)
    expect(after.body).toMatchObject({ text: before.body.text, revision: before.body.revision })
  })

  it('previews without storing anything, reporting problems by line', async () => {
    const before = await author.client.get<PageReply>(`/api/companions/${slug}/page`)
    const revisions = await author.client.get<RevisionsReply>(`/api/companions/${slug}/revisions`)
    const reply = await author.client.post<PageReply>(`/api/companions/${slug}/page/preview`, { text: '## Preview\n\n$E = mc^2$\n\n@figur 1\n\n@table 999999' })
    expect(reply.status).toBe(200)
    expect(reply.body.blocks.map(b => b.kind)).toEqual(['html', 'table'])
    expect(reply.body.blocks[0]!.html).toContain('class="katex"')
    expect(reply.body.problems.map(p => p.line)).toEqual([5, 7])
    const after = await author.client.get<PageReply>(`/api/companions/${slug}/page`)
    expect(after.body).toMatchObject({ text: before.body.text, revision: before.body.revision })
    const revisionsAfter = await author.client.get<RevisionsReply>(`/api/companions/${slug}/revisions`)
    expect(revisionsAfter.body.revisions).toHaveLength(revisions.body.revisions.length)
  })

  it('does not let a reader write or preview the page', async () => {
    const put = await reader.client.request('PUT', `/api/companions/${slug}/page`, { text: 'A reader was here.' })
    expect(put.status).toBe(403)
    const preview = await reader.client.post(`/api/companions/${slug}/page/preview`, { text: 'x' })
    expect(preview.status).toBe(403)
    const page = await reader.client.get<PageReply>(`/api/companions/${slug}/page`)
    expect(page.body.text).not.toContain('A reader was here.')
  })
})

describe('restoring a revision', () => {
  it('brings back the page text of that revision, in the database and in page.md', async () => {
    const first = await author.client.request<{ revision: string }>('PUT', `/api/companions/${slug}/page`, { text: 'First wording of the page.\n', message: 'first wording' })
    await author.client.request('PUT', `/api/companions/${slug}/page`, { text: 'Second wording of the page.\n', message: 'second wording' })
    const restored = await author.client.post<{ revision: string }>(`/api/companions/${slug}/revisions/${first.body.revision}/restore`)
    expect(restored.status).toBe(200)
    const page = await reader.client.get<PageReply>(`/api/companions/${slug}/page`)
    expect(page.body.text).toBe('First wording of the page.\n')
    expect(page.body.revision).toBe(restored.body.revision)
    const archive = await fetch(`${baseUrl}/files/${slug}/archive?revision=${restored.body.revision}`, { headers: { 'cookie': author.client.cookie, 'origin': baseUrl, 'x-forwarded-for': author.client.address } })
    const files = unzipSync(new Uint8Array(await archive.arrayBuffer()))
    const name = Object.keys(files).find(f => f.endsWith('page.md'))!
    expect(strFromU8(files[name]!)).toBe('First wording of the page.\n')
  })
})

describe('two writers', () => {
  it('refuses a save over a text someone else saved after the writer loaded the page, and keeps theirs', async () => {
    const coauthor = await signUp('page-coauthor')
    expect((await author.client.post(`/api/companions/${slug}/members`, { email: coauthor.email, role: 'author' })).status).toBe(201)
    const loaded = await author.client.get<PageReply & { textHash: string }>(`/api/companions/${slug}/page`)
    const other = await coauthor.client.get<PageReply & { textHash: string }>(`/api/companions/${slug}/page`)
    expect(other.body.textHash).toBe(loaded.body.textHash)
    // The hash is the SHA-256 of the stored text (FIPS 180-4), as any sha256 tool gives it.
    expect(loaded.body.textHash).toBe(createHash('sha256').update(loaded.body.text).digest('hex'))
    const first = await coauthor.client.request<{ textHash: string }>('PUT', `/api/companions/${slug}/page`, { text: 'The co-author\'s wording.\n', basedOn: other.body.textHash })
    expect(first.status).toBe(200)
    const late = await author.client.request<{ message: string, data: { current: { text: string } } }>('PUT', `/api/companions/${slug}/page`, { text: 'The author\'s wording.\n', basedOn: loaded.body.textHash })
    expect(late.status).toBe(409)
    expect(late.body.data.current.text).toBe('The co-author\'s wording.\n')
    expect((await reader.client.get<PageReply>(`/api/companions/${slug}/page`)).body.text).toBe('The co-author\'s wording.\n')
    // Based on the newer text, the save goes through.
    expect((await author.client.request('PUT', `/api/companions/${slug}/page`, { text: 'The author\'s wording.\n', basedOn: first.body.textHash })).status).toBe(200)
  })
})
