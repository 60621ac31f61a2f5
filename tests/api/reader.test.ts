// The reader's side: the public list of published companions and its search (authors' names yes,
// reviewers' names never), citation downloads read back by a reference BibTeX parser
// (@citation-js/plugin-bibtex), and the authors' choice of licence. People are invented.
import { Cite } from '@citation-js/core'
import '@citation-js/plugin-bibtex'
import { beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, planeSetting, signUp, uniqueCsv, uniqueName, withDatabase } from '../support/http'
import type { TestAccount } from '../support/http'

interface PublishedPage { items: Array<{ slug: string, title: string, authors: string[], license: string, publishedAt: string | null }>, total: number, page: number, pageSize: number }
interface Fields { data: { fields: Record<string, string> } }

const tag = uniqueName('Qx').replace(/[^A-Za-z0-9]/g, '')
const authorFamily = `Vantablick${tag}`
const secondFamily = `Orrensay${tag}`
const reviewerFamily = `Hollowmere${tag}`
const published = uniqueName('reader-pub-')
const draft = uniqueName('reader-draft-')
let editor: TestAccount
let author: TestAccount
let reviewer: TestAccount
let ensembleId = 0

async function rename(account: TestAccount, displayName: string) {
  const reply = await account.client.patch('/api/account', { displayName, affiliation: '', orcid: '' })
  if (reply.status !== 200) throw new Error(`rename failed: ${reply.status}`)
}

async function search(q: string, client = new ApiClient()): Promise<PublishedPage> {
  const reply = await client.get<PublishedPage>(`/api/published?q=${encodeURIComponent(q)}`)
  expect(reply.status).toBe(200)
  return reply.body
}

beforeAll(async () => {
  editor = await signUp('reader-editor')
  author = await signUp('reader-author')
  const second = await signUp('reader-second')
  reviewer = await signUp('reader-reviewer')
  await rename(author, `Zoë ${authorFamily}`)
  await rename(second, `Ilse ${secondFamily}`)
  await rename(reviewer, `Marten ${reviewerFamily}`)
  for (const slug of [published, draft]) {
    const made = await editor.client.post('/api/companions', { title: `Screened plasmas ${tag} at ${slug}`, slug, abstract: `Invented abstract about jellium ${tag}.`, manuscriptRef: `MS-${tag}` })
    if (made.status !== 201) throw new Error(`companion not made: ${made.status}`)
    for (const [who, role] of [[author, 'author'], [second, 'author'], [reviewer, 'reviewer']] as const) {
      const added = await editor.client.post(`/api/companions/${slug}/members`, { email: who.email, role })
      if (added.status !== 201) throw new Error(`member not added: ${added.status}`)
    }
  }
  const upload = await author.client.upload<{ id: number }>(`/api/companions/${published}/ensembles`, planeSetting('Invented plane sample'), 'plane_sample.csv', uniqueCsv())
  if (upload.status !== 201) throw new Error(`upload failed: ${upload.status}`)
  ensembleId = upload.body.id
  // The state-change route belongs to the review workflow; here the state is set directly.
  await withDatabase(c => c.query('UPDATE companion SET state = ?, published_at = ? WHERE slug = ?', ['published', new Date('2026-10-05T12:00:00Z'), published]))
})

describe('published list', () => {
  it('lists a published companion with its authors in joining order, date and licence', async () => {
    const page = await search(tag)
    expect(page.items.map(i => i.slug)).toEqual([published])
    const [item] = page.items
    expect(item!.authors).toEqual([`Zoë ${authorFamily}`, `Ilse ${secondFamily}`])
    expect(item!.license).toBe('CC-BY-4.0')
    expect(new Date(item!.publishedAt!).toISOString()).toBe('2026-10-05T12:00:00.000Z')
    expect(JSON.stringify(page)).not.toContain(reviewerFamily)
  })

  it('finds it by an author\'s name, the abstract and the manuscript reference', async () => {
    expect((await search(authorFamily)).items.map(i => i.slug)).toEqual([published])
    expect((await search(`zoë ${secondFamily.toLowerCase()}`)).items.map(i => i.slug)).toEqual([published])
    expect((await search(`jellium ${tag}`)).items.map(i => i.slug)).toEqual([published])
    expect((await search(`MS-${tag}`)).items.map(i => i.slug)).toEqual([published])
  })

  it('never finds it by a reviewer\'s name, even for its members', async () => {
    expect((await search(reviewerFamily)).items).toEqual([])
    expect((await search(reviewerFamily, editor.client)).items).toEqual([])
  })

  it('leaves unpublished companions out, also for their editor', async () => {
    expect((await search(draft)).items).toEqual([])
    expect((await search(draft, editor.client)).items).toEqual([])
  })

  it('refuses a bad page with a message on that field', async () => {
    const reply = await new ApiClient().get<Fields>('/api/published?page=0')
    expect(reply.status).toBe(422)
    expect(reply.body.data.fields.page).toMatch(/start at 1/)
  })
})

describe('citation downloads', () => {
  it('serves BibTeX of a published companion to anyone, as a file that parses', async () => {
    const reply = await new ApiClient().get<string>(`/files/${published}/cite?format=bibtex`)
    expect(reply.status).toBe(200)
    expect(reply.headers.get('content-type')).toMatch(/^application\/x-bibtex/)
    expect(reply.headers.get('content-disposition')).toBe(`attachment; filename="qf-${published}.bib"`)
    const [item] = new Cite(reply.body).data as Array<{ 'title': string, 'author': Array<{ family: string, given: string }>, 'issued': { 'date-parts': number[][] }, 'URL': string, 'citation-key': string }>
    expect(item!.title).toBe(`Screened plasmas ${tag} at ${published}`)
    expect(item!.author).toEqual([{ family: authorFamily, given: 'Zoë' }, { family: secondFamily, given: 'Ilse' }])
    expect(item!.issued['date-parts'][0]![0]).toBe(2026)
    expect(item!.URL).toMatch(new RegExp(`/c/${published}$`))
    expect(item!['citation-key']).toBe(`qf:${published}`)
    expect(reply.body).not.toContain(reviewerFamily)
  })

  it('serves CSL-JSON of a dataset with its checksum and convention', async () => {
    const reply = await new ApiClient().get<Array<Record<string, unknown>>>(`/files/${published}/cite?format=csl-json&ensemble=${ensembleId}`)
    expect(reply.status).toBe(200)
    expect(reply.headers.get('content-type')).toMatch(/^application\/vnd\.citationstyles\.csl\+json/)
    expect(reply.headers.get('content-disposition')).toBe(`attachment; filename="qf-${published}-data-${ensembleId}.csl.json"`)
    const [item] = reply.body
    const ensemble = await editor.client.get<{ ensemble: { sha256: string } }>(`/api/companions/${published}/ensembles/${ensembleId}`)
    expect(item).toMatchObject({ type: 'dataset', license: 'CC-BY-4.0', issued: { 'date-parts': [[2026, 10, 5]] } })
    expect(String(item!.URL)).toMatch(new RegExp(`/c/${published}/data/${ensembleId}$`))
    expect(String(item!.note)).toContain(`SHA-256 ${ensemble.body.ensemble.sha256}`)
    expect(String(item!.note)).toMatch(/Quillfield engine \d+\.\d+\.\d+/)
    expect(String(item!.note)).toContain('convention Σ_{i≠j}')
  })

  it('hides an unpublished companion\'s citation from the public and marks it for members', async () => {
    expect((await new ApiClient().get(`/files/${draft}/cite?format=bibtex`)).status).toBe(404)
    const member = await reviewer.client.get<Array<{ note: string, issued?: unknown }>>(`/files/${draft}/cite?format=csl-json`)
    expect(member.status).toBe(200)
    expect(member.body[0]!.note).toMatch(/^Not yet published/)
    expect(member.body[0]!.issued).toBeUndefined()
  })

  it('refuses an unknown format or ensemble', async () => {
    const bad = await new ApiClient().get<Fields>(`/files/${published}/cite?format=ris`)
    expect(bad.status).toBe(422)
    expect(bad.body.data.fields.format).toMatch(/bibtex or csl-json/)
    expect((await new ApiClient().get(`/files/${published}/cite?format=bibtex&ensemble=999999999`)).status).toBe(404)
  })
})

describe('licence', () => {
  it('is the editor\'s to change once published, is audited, and the citation follows', async () => {
    // Published: authors no longer change the companion (the course's rule); the editor still may.
    const refused = await author.client.request<{ message: string }>('PUT', `/api/companions/${published}/license`, { license: 'CC0-1.0' })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/published/)
    const reply = await editor.client.request<{ license: string, changed: boolean }>('PUT', `/api/companions/${published}/license`, { license: 'CC0-1.0' })
    expect(reply.status).toBe(200)
    expect(reply.body).toEqual({ license: 'CC0-1.0', changed: true })
    const events = await withDatabase(async (c) => {
      const [rows] = await c.query('SELECT e.detail, e.actor_id FROM companion_event e JOIN companion p ON p.id = e.companion_id WHERE p.slug = ? AND e.kind = ?', [published, 'license'])
      return rows as Array<{ detail: unknown, actor_id: string }>
    })
    expect(events).toHaveLength(1)
    const detail = typeof events[0]!.detail === 'string' ? JSON.parse(events[0]!.detail) : events[0]!.detail
    expect(detail).toEqual({ from: 'CC-BY-4.0', to: 'CC0-1.0' })
    expect(events[0]!.actor_id).toBe(editor.id)
    const cited = await new ApiClient().get<Array<{ license: string }>>(`/files/${published}/cite?format=csl-json`)
    expect(cited.body[0]!.license).toBe('CC0-1.0')
    expect((await search(authorFamily)).items[0]!.license).toBe('CC0-1.0')
  })

  it('answers 422 with a field message on an unknown licence and keeps the old one', async () => {
    const reply = await author.client.request<Fields>('PUT', `/api/companions/${published}/license`, { license: 'All-Rights-Reserved' })
    expect(reply.status).toBe(422)
    expect(reply.body.data.fields.license).toMatch(/CC-BY-4.0/)
    const sheet = await author.client.get<{ license: string }>(`/api/companions/${published}/citation`)
    expect(sheet.body.license).toBe('CC0-1.0')
  })

  it('is the authors\' choice while the companion is a draft', async () => {
    const reply = await author.client.request<{ license: string, changed: boolean }>('PUT', `/api/companions/${draft}/license`, { license: 'CC-BY-SA-4.0' })
    expect(reply.status).toBe(200)
    expect(reply.body).toEqual({ license: 'CC-BY-SA-4.0', changed: true })
  })

  it('is not the reviewers\' choice', async () => {
    const reply = await reviewer.client.request('PUT', `/api/companions/${published}/license`, { license: 'CC-BY-SA-4.0' })
    expect(reply.status).toBe(403)
  })
})
