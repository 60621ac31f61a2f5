import { describe, expect, it } from 'vitest'
import { ApiClient, signUp, uniqueName, withDatabase } from '../support/http'

interface CompanionList { companions: Array<{ slug: string, role: string | null, state: string }> }

describe('companions and members', () => {
  it('creates a companion whose creator is its editor and lists it', async () => {
    const editor = await signUp('creator')
    const slug = uniqueName('comp-')
    const created = await editor.client.post<{ slug: string }>('/api/companions', { title: 'A companion for a test manuscript', slug, abstract: 'Short.', manuscriptRef: 'T-1' })
    expect(created.status).toBe(201)
    expect(created.body.slug).toBe(slug)
    const list = await editor.client.get<CompanionList>('/api/companions')
    expect(list.body.companions.find(c => c.slug === slug)).toMatchObject({ role: 'editor', state: 'draft' })
    const one = await editor.client.get<{ companion: { title: string }, role: string }>(`/api/companions/${slug}`)
    expect(one.body).toMatchObject({ role: 'editor', companion: { title: 'A companion for a test manuscript' } })
  })

  it('refuses a taken short name with a message on that field', async () => {
    const editor = await signUp('taken')
    const slug = uniqueName('taken-')
    await editor.client.post('/api/companions', { title: 'First of two', slug })
    const again = await editor.client.post<{ data: { fields: Record<string, string> } }>('/api/companions', { title: 'Second of two', slug })
    expect(again.status).toBe(409)
    expect(again.body.data.fields.slug).toMatch(/taken/)
  })

  it('adds, re-roles and removes members, and keeps the last editor', async () => {
    const editor = await signUp('ed')
    const other = await signUp('other')
    const slug = uniqueName('members-')
    await editor.client.post('/api/companions', { title: 'Members test', slug })

    const hidden = await other.client.get(`/api/companions/${slug}`)
    expect(hidden.status).toBe(404)

    const added = await editor.client.post(`/api/companions/${slug}/members`, { email: other.email, role: 'reviewer' })
    expect(added.status).toBe(201)
    expect((await other.client.get<{ role: string }>(`/api/companions/${slug}`)).body.role).toBe('reviewer')
    expect((await other.client.get(`/api/companions/${slug}/members`)).status).toBe(403)

    const twice = await editor.client.post(`/api/companions/${slug}/members`, { email: other.email, role: 'author' })
    expect(twice.status).toBe(409)

    expect((await editor.client.patch(`/api/companions/${slug}/members/${other.id}`, { role: 'author' })).status).toBe(200)
    const members = await editor.client.get<{ members: Array<{ userId: string, role: string }> }>(`/api/companions/${slug}/members`)
    expect(members.body.members.map(m => [m.userId, m.role])).toEqual(expect.arrayContaining([[editor.id, 'editor'], [other.id, 'author']]))

    expect((await editor.client.patch(`/api/companions/${slug}/members/${editor.id}`, { role: 'author' })).status).toBe(409)
    expect((await editor.client.delete(`/api/companions/${slug}/members/${editor.id}`)).status).toBe(409)

    expect((await editor.client.delete(`/api/companions/${slug}/members/${other.id}`)).status).toBe(204)
    expect((await other.client.get(`/api/companions/${slug}`)).status).toBe(404)
  })

  it('says which field is wrong when the account to add does not exist', async () => {
    const editor = await signUp('ed2')
    const slug = uniqueName('nobody-')
    await editor.client.post('/api/companions', { title: 'Nobody test', slug })
    const reply = await editor.client.post<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/members`, { email: `${uniqueName('ghost')}@tests.example`, role: 'author' })
    expect(reply.status).toBe(422)
    expect(reply.body.data.fields.email).toMatch(/no account/i)
  })

  it('opens a published companion to everyone as readers, and only that', async () => {
    const editor = await signUp('pub')
    const slug = uniqueName('pub-')
    await editor.client.post('/api/companions', { title: 'Published test', slug })
    const anonymous = new ApiClient()
    expect((await anonymous.get(`/api/companions/${slug}`)).status).toBe(404)
    await withDatabase(c => c.query('UPDATE companion SET state = ? WHERE slug = ?', ['published', slug]))
    const open = await anonymous.get<{ role: string }>(`/api/companions/${slug}`)
    expect(open.status).toBe(200)
    expect(open.body.role).toBe('reader')
    expect((await anonymous.patch(`/api/companions/${slug}`, { title: 'Changed by nobody' })).status).toBe(401)
    const list = await anonymous.get<CompanionList>(`/api/companions?q=${encodeURIComponent('Published test')}`)
    expect(list.body.companions.map(c => c.slug)).toContain(slug)
    expect(list.body.companions.every(c => c.state === 'published')).toBe(true)
  })
})
