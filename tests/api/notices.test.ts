// Remark notifications by preference: 'daily' queues a notice instead of mailing, the digest
// gathers an account's notices into one message with an unsubscribe link, and that link turns
// remark mail off without signing in.
import { beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, makeAdmin, planeSetting, signUp, uniqueCsv, uniqueName, withDatabase } from '../support/http'
import type { TestAccount } from '../support/http'
import { linkIn, mailTo, waitForMail } from '../support/mail'

let editor: TestAccount
let author: TestAccount
let reviewer: TestAccount
let admin: TestAccount
let slug = ''

async function pendingFor(userId: string): Promise<Array<{ subject: string, link: string, sent_at: Date | null }>> {
  return withDatabase(async (c) => {
    const [rows] = await c.query('SELECT subject, link, sent_at FROM pending_notice WHERE user_id = ? ORDER BY id', [userId])
    return rows as Array<{ subject: string, link: string, sent_at: Date | null }>
  })
}

beforeAll(async () => {
  editor = await signUp('notice-editor')
  author = await signUp('notice-author')
  reviewer = await signUp('notice-reviewer')
  admin = await signUp('notice-admin')
  await makeAdmin(admin)
  slug = uniqueName('notices-')
  expect((await editor.client.post('/api/companions', { title: 'Notices', slug })).status).toBe(201)
  for (const [who, role] of [[author, 'author'], [reviewer, 'reviewer']] as const) {
    expect((await editor.client.post(`/api/companions/${slug}/members`, { email: who.email, role })).status).toBe(201)
  }
  const up = await editor.client.upload<{ id: number }>(`/api/companions/${slug}/ensembles`, planeSetting('points'), 'points.csv', uniqueCsv(8))
  const c = await editor.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'g', quantity: 'statistic:pair-correlation', ensembleIds: [up.body.id], parameters: { 'window-radius': 0.9, 'bins': 4, 'rmax': 0.2 } })
  expect((await editor.client.post(`/api/companions/${slug}/figures`, { title: 'g(r)', template: 'pair-correlation', computationIds: [c.body.id] })).status).toBe(201)
})

describe('remark notices', () => {
  it('reads and sets the remark mail preference on the account, refusing unknown choices', async () => {
    expect((await author.client.get<{ account: { remarkMail: string } }>('/api/account')).body.account.remarkMail).toBe('immediate')
    const bad = await author.client.patch<{ data: { fields: Record<string, string> } }>('/api/account', { displayName: 'Test author', affiliation: '', orcid: '', remarkMail: 'weekly' })
    expect(bad.status).toBe(422)
    expect(Object.keys(bad.body.data.fields)).toEqual(['remarkMail'])
    expect((await author.client.patch('/api/account', { displayName: 'Test author', affiliation: '', orcid: '', remarkMail: 'daily' })).status).toBe(200)
    expect((await author.client.get<{ account: { remarkMail: string } }>('/api/account')).body.account.remarkMail).toBe('daily')
  })

  it('queues notices for a daily reader instead of mailing them, and mails an immediate one', async () => {
    const first = await reviewer.client.post<{ remark: { id: number } }>(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'datum', x: 0.1, y: 0.9 }, body: 'First point of doubt.' })
    expect(first.status).toBe(201)
    const second = await reviewer.client.post<{ remark: { id: number } }>(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'figure' }, body: 'Second point of doubt.' })
    expect(second.status).toBe(201)
    // The editor kept the default: mailed at once (this also shows the daily author's mail would have arrived by now).
    await waitForMail(editor.email, /opened a remark on figure 1/)
    // (the address-confirmation message of sign-up is the only one the author has)
    expect((await mailTo(author.email)).filter(m => /remark/.test(m.subject))).toEqual([])
    const queued = await pendingFor(author.id)
    expect(queued.map(n => n.sent_at)).toEqual([null, null])
    expect(queued.map(n => n.link)).toEqual([
      expect.stringContaining(`/c/${slug}/figures/1#remark-${first.body.remark.id}`),
      expect.stringContaining(`/c/${slug}/figures/1#remark-${second.body.remark.id}`),
    ])
  })

  it('sends each account one digest on the administrator\'s request, with an unsubscribe link, and marks the notices sent', async () => {
    expect((await author.client.post('/api/admin/digests', {})).status).toBe(403)
    const run = await admin.client.post<{ sent: { digests: number, notices: number } }>('/api/admin/digests', {})
    expect(run.status).toBe(200)
    expect(run.body.sent.digests).toBeGreaterThanOrEqual(1)
    expect(run.body.sent.notices).toBeGreaterThanOrEqual(2)
    const digests = (await mailTo(author.email)).filter(m => /digest/i.test(m.subject))
    expect(digests).toHaveLength(1)
    const digest = digests[0]!
    expect(digest.text).toContain('First point of doubt.')
    expect(digest.text).toContain('Second point of doubt.')
    expect(digest.html).toContain('/mail/stop?key=')
    expect(linkIn(digest, '/mail/stop?key=')).toMatch(/^https?:\/\/[^/]+\/mail\/stop\?key=[\w-]+$/)
    // The same link as a List-Unsubscribe header, so mail programs offer it (RFC 2369).
    expect(digest.headers['list-unsubscribe']).toBe(`<${linkIn(digest, '/mail/stop?key=')}>`)
    expect((await pendingFor(author.id)).every(n => n.sent_at !== null)).toBe(true)
    // Nothing is sent twice.
    await admin.client.post('/api/admin/digests', {})
    expect((await mailTo(author.email)).filter(m => /digest/i.test(m.subject))).toHaveLength(1)
  })

  it('turns remark mail off through the digest\'s link, without signing in; an unknown key is 404', async () => {
    const digest = await waitForMail(author.email, /digest/i)
    const key = new URL(linkIn(digest, '/mail/stop')).searchParams.get('key')!
    expect(key.length).toBeGreaterThan(10)
    const stranger = new ApiClient()
    expect((await stranger.post('/api/mail/stop', { key: `${key}x` })).status).toBe(404)
    const stopped = await stranger.post('/api/mail/stop', { key })
    expect(stopped.status).toBe(200)
    expect((await author.client.get<{ account: { remarkMail: string } }>('/api/account')).body.account.remarkMail).toBe('none')
    // With 'none', a new remark neither mails nor queues anything for the author.
    // (the notices are made before the remark's request is answered)
    expect((await reviewer.client.post(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'figure' }, body: 'Third point of doubt.' })).status).toBe(201)
    expect((await pendingFor(author.id)).length).toBe(2)
    const empty = await stranger.post<{ data: { fields: Record<string, string> } }>('/api/mail/stop', {})
    expect(empty.status).toBe(422)
    expect(Object.keys(empty.body.data.fields)).toEqual(['key'])
  })
})
