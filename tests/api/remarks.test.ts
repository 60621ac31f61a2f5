// Remarks pinned to figures: threads with datum and region anchors, replies, settling, validation,
// reviewers' anonymity towards authors (in the JSON and in the mail they get), and who may read.
import { beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, planeSetting, signUp, uniqueCsv, uniqueName, withDatabase } from '../support/http'
import type { TestAccount } from '../support/http'
import { mailTo, waitForMail } from '../support/mail'

interface Shown { name: string, userId: string | null, anonymous: boolean }
interface Remark {
  id: number
  figureNumber: number
  revision: string
  state: 'open' | 'settled'
  anchor: Record<string, unknown>
  author: Shown
  messages: Array<{ body: string, author: Shown }>
  canSettle: boolean
}

let editor: TestAccount
let author: TestAccount
let reviewer: TestAccount
let otherReviewer: TestAccount
let reader: TestAccount
let slug = ''
let head = ''
const reviewerName = `Quinta Marlowe ${Date.now().toString(36)}`

/** A companion with one figure (its computation need not have run: remarks only need the figure). */
async function companionWithFigure(owner: TestAccount, prefix: string): Promise<string> {
  const s = uniqueName(prefix)
  expect((await owner.client.post('/api/companions', { title: `Remarks on ${prefix}`, slug: s })).status).toBe(201)
  const up = await owner.client.upload<{ id: number }>(`/api/companions/${s}/ensembles`, planeSetting('points'), 'points.csv', uniqueCsv(12))
  expect(up.status).toBe(201)
  const c = await owner.client.post<{ id: number }>(`/api/companions/${s}/computations`, { name: 'g', quantity: 'statistic:pair-correlation', ensembleIds: [up.body.id], parameters: { 'window-radius': 0.9, 'bins': 4, 'rmax': 0.2 } })
  expect(c.status).toBe(201)
  expect((await owner.client.post(`/api/companions/${s}/figures`, { title: 'g(r)', template: 'pair-correlation', computationIds: [c.body.id] })).status).toBe(201)
  return s
}

beforeAll(async () => {
  editor = await signUp('remark-editor')
  author = await signUp('remark-author')
  reviewer = await signUp('remark-reviewer')
  otherReviewer = await signUp('remark-second')
  reader = await signUp('remark-reader')
  expect((await reviewer.client.patch('/api/account', { displayName: reviewerName, affiliation: '', orcid: '' })).status).toBe(200)
  slug = await companionWithFigure(editor, 'remarks-')
  for (const [who, role] of [[author, 'author'], [reviewer, 'reviewer'], [otherReviewer, 'reviewer'], [reader, 'reader']] as const) {
    expect((await editor.client.post(`/api/companions/${slug}/members`, { email: who.email, role })).status).toBe(201)
  }
  const revisions = await editor.client.get<{ revisions: Array<{ oid: string }> }>(`/api/companions/${slug}/revisions`)
  head = revisions.body.revisions[0]!.oid
})

describe('remarks', () => {
  let datumId = 0

  it('opens a remark at a datum on the current revision, and lists it with its message', async () => {
    const made = await reviewer.client.post<{ remark: Remark }>(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'datum', x: 0.05, y: 1.25, series: 'g(r), shell average', row: 2 }, body: 'This bin looks high compared with its neighbours.' })
    expect(made.status).toBe(201)
    datumId = made.body.remark.id
    expect(made.body.remark.revision).toBe(head)
    expect(made.body.remark.anchor).toEqual({ kind: 'datum', x: 0.05, y: 1.25, series: 'g(r), shell average', row: 2 })
    expect(made.body.remark.state).toBe('open')
    expect(made.body.remark.author.name).toBe(reviewerName)
    const list = await reviewer.client.get<{ remarks: Remark[] }>(`/api/companions/${slug}/remarks?figure=1`)
    const found = list.body.remarks.find(r => r.id === datumId)!
    expect(found.messages.map(m => m.body)).toEqual(['This bin looks high compared with its neighbours.'])
    expect(found.figureNumber).toBe(1)
  })

  it('opens a remark on a region, and records an audit entry without the text', async () => {
    const made = await reviewer.client.post<{ remark: Remark }>(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'region', x0: 0.02, x1: 0.08, y0: 0.5, y1: 1.5 }, body: 'A confidential-looking sentence about the short range.' })
    expect(made.status).toBe(201)
    expect(made.body.remark.anchor).toEqual({ kind: 'region', x0: 0.02, x1: 0.08, y0: 0.5, y1: 1.5 })
    const events = await withDatabase(async (c) => {
      const [rows] = await c.query('SELECT e.kind, e.detail, e.reason FROM companion_event e JOIN companion p ON p.id = e.companion_id WHERE p.slug = ? AND e.kind = ?', [slug, 'remark'])
      return rows as Array<{ kind: string, detail: unknown, reason: string }>
    })
    expect(events.length).toBeGreaterThanOrEqual(2)
    expect(JSON.stringify(events)).not.toContain('confidential-looking')
  })

  it('answers 422 with a message per field for a bad figure, anchor or body, and stores nothing', async () => {
    const before = (await editor.client.get<{ remarks: Remark[] }>(`/api/companions/${slug}/remarks`)).body.remarks.length
    const noFigure = await reviewer.client.post<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/remarks`, { figureNumber: 9, anchor: { kind: 'figure' }, body: 'Where is it?' })
    expect(noFigure.status).toBe(422)
    expect(Object.keys(noFigure.body.data.fields)).toEqual(['figureNumber'])
    const badRegion = await reviewer.client.post<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'region', x0: 0.3, x1: 0.1, y0: 1, y1: 0.5 }, body: 'Inside out.' })
    expect(badRegion.status).toBe(422)
    expect(badRegion.body.data.fields).toHaveProperty(['anchor.x1'])
    expect(badRegion.body.data.fields).toHaveProperty(['anchor.y1'])
    const notNumber = await reviewer.client.post<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'datum', x: 'near', y: null }, body: '' })
    expect(notNumber.status).toBe(422)
    expect(notNumber.body.data.fields).toHaveProperty(['anchor.x'])
    expect(notNumber.body.data.fields).toHaveProperty(['anchor.y'])
    expect(notNumber.body.data.fields).toHaveProperty(['body'])
    const tooLong = await reviewer.client.post<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'figure' }, body: 'x'.repeat(5001) })
    expect(tooLong.status).toBe(422)
    expect(Object.keys(tooLong.body.data.fields)).toEqual(['body'])
    const after = (await editor.client.get<{ remarks: Remark[] }>(`/api/companions/${slug}/remarks`)).body.remarks.length
    expect(after).toBe(before)
  })

  it('shows the author "Reviewer 1" and never the reviewer\'s name, id or e-mail, anywhere in the answer', async () => {
    const reply = await author.client.request('GET', `/api/companions/${slug}/remarks`)
    expect(reply.status).toBe(200)
    const text = JSON.stringify(reply.body)
    expect(text).not.toContain(reviewerName)
    expect(text).not.toContain(reviewer.email)
    expect(text).not.toContain(reviewer.id)
    const one = await author.client.get<{ remark: Remark }>(`/api/companions/${slug}/remarks/${datumId}`)
    expect(one.body.remark.author).toMatchObject({ name: 'Reviewer 1', anonymous: true, userId: null })
    expect(JSON.stringify(one.body)).not.toContain(reviewerName)
  })

  it('mails the author at once, naming the reviewer as "Reviewer 1" only', async () => {
    await waitForMail(author.email, /opened a remark on figure 1/)
    const mails = (await mailTo(author.email)).filter(m => m.text.includes(`/c/${slug}/figures/1#remark-${datumId}`))
    expect(mails).toHaveLength(1)
    const mail = mails[0]!
    expect(mail.subject).toContain('Reviewer 1')
    expect(mail.text).toContain('This bin looks high')
    expect(`${mail.subject}\n${mail.text}\n${mail.html}`).not.toContain(reviewerName)
    // The writer is never told about their own remark.
    expect((await mailTo(reviewer.email)).filter(m => m.text.includes(`#remark-${datumId}`))).toEqual([])
  })

  it('takes a reply from the author; the reviewer who opened the thread is told, the other reviewer is not', async () => {
    const reply = await author.client.post<{ remark: Remark }>(`/api/companions/${slug}/remarks/${datumId}/messages`, { body: 'The bin is narrow; we will widen it in the next revision.' })
    expect(reply.status).toBe(201)
    expect(reply.body.remark.messages.map(m => m.body)).toEqual(['This bin looks high compared with its neighbours.', 'The bin is narrow; we will widen it in the next revision.'])
    const mail = await waitForMail(reviewer.email, /replied to a remark on figure 1/)
    expect(mail.text).toContain('widen it')
    expect((await mailTo(otherReviewer.email)).filter(m => m.text.includes(`#remark-${datumId}`))).toEqual([])
    const empty = await author.client.post<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/remarks/${datumId}/messages`, { body: '   ' })
    expect(empty.status).toBe(422)
    expect(Object.keys(empty.body.data.fields)).toEqual(['body'])
  })

  it('lists on the desk the open threads whose last word is someone else\'s, named as the companion names them', async () => {
    type Waiting = { remarks: Array<{ remarkId: number, lastBy: { name: string }, excerpt: string }> }
    // After the author's reply: the reviewer who opened the thread owes the next word, the author does not.
    const forReviewer = await reviewer.client.get<Waiting>('/api/account/remarks')
    expect(forReviewer.body.remarks.find(r => r.remarkId === datumId)?.excerpt).toContain('widen it')
    expect((await author.client.get<Waiting>('/api/account/remarks')).body.remarks.map(r => r.remarkId)).not.toContain(datumId)
    // The other reviewer took no part in it; the editor sees every open thread.
    expect((await otherReviewer.client.get<Waiting>('/api/account/remarks')).body.remarks.map(r => r.remarkId)).not.toContain(datumId)
    expect((await editor.client.get<Waiting>('/api/account/remarks')).body.remarks.map(r => r.remarkId)).toContain(datumId)
    // A thread the reviewer opened and nobody answered waits for the author, with the reviewer numbered.
    const forAuthor = await author.client.get<Waiting>('/api/account/remarks')
    expect(forAuthor.body.remarks.length).toBeGreaterThan(0)
    expect(forAuthor.body.remarks.every(r => r.lastBy.name === 'Reviewer 1')).toBe(true)
    expect(JSON.stringify(forAuthor.body)).not.toContain(reviewerName)
  })

  it('is settled and reopened by its writer or an author, never by another reviewer', async () => {
    const other = await otherReviewer.client.patch(`/api/companions/${slug}/remarks/${datumId}`, { state: 'settled' })
    expect(other.status).toBe(403)
    const settled = await author.client.patch<{ remark: Remark }>(`/api/companions/${slug}/remarks/${datumId}`, { state: 'settled' })
    expect(settled.status).toBe(200)
    expect(settled.body.remark.state).toBe('settled')
    const openOnly = await author.client.get<{ remarks: Remark[] }>(`/api/companions/${slug}/remarks?state=open`)
    expect(openOnly.body.remarks.map(r => r.id)).not.toContain(datumId)
    const settledOnly = await author.client.get<{ remarks: Remark[] }>(`/api/companions/${slug}/remarks?state=settled`)
    expect(settledOnly.body.remarks.map(r => r.id)).toContain(datumId)
    const reopened = await reviewer.client.patch<{ remark: Remark }>(`/api/companions/${slug}/remarks/${datumId}`, { state: 'open' })
    expect(reopened.status).toBe(200)
    expect(reopened.body.remark.state).toBe('open')
    const bad = await reviewer.client.patch<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/remarks/${datumId}`, { state: 'closed' })
    expect(bad.status).toBe(422)
    expect(Object.keys(bad.body.data.fields)).toEqual(['state'])
  })

  it('shows names to the author once the editor opens identities', async () => {
    await withDatabase(c => c.query('UPDATE companion SET identities_open = 1 WHERE slug = ?', [slug]))
    try {
      const one = await author.client.get<{ remark: Remark }>(`/api/companions/${slug}/remarks/${datumId}`)
      expect(one.body.remark.author).toMatchObject({ name: reviewerName, anonymous: false })
    }
    finally {
      await withDatabase(c => c.query('UPDATE companion SET identities_open = 0 WHERE slug = ?', [slug]))
    }
  })

  it('keeps remarks from readers and the public, on a published companion too, until they are made public', async () => {
    expect((await reader.client.get(`/api/companions/${slug}/remarks`)).status).toBe(403)
    expect((await new ApiClient().get(`/api/companions/${slug}/remarks`)).status).toBe(404)
    expect((await reader.client.post(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'figure' }, body: 'A reader writes.' })).status).toBe(403)
    const published = await companionWithFigure(editor, 'remarks-pub-')
    await withDatabase(c => c.query('UPDATE companion SET state = ? WHERE slug = ?', ['published', published]))
    expect((await reader.client.get(`/api/companions/${published}/remarks`)).status).toBe(403)
    expect((await new ApiClient().get(`/api/companions/${published}/remarks`)).status).toBe(404)
    await withDatabase(c => c.query('UPDATE companion SET remarks_public = 1 WHERE slug = ?', [published]))
    const open = await reader.client.get<{ remarks: Remark[] }>(`/api/companions/${published}/remarks`)
    expect(open.status).toBe(200)
    expect(open.body.remarks).toEqual([])
    expect((await new ApiClient().get(`/api/companions/${published}/remarks`)).status).toBe(200)
    // Public remarks are still written only by members from reviewer up.
    expect((await reader.client.post(`/api/companions/${published}/remarks`, { figureNumber: 1, anchor: { kind: 'figure' }, body: 'A reader writes.' })).status).toBe(403)
  })
})
