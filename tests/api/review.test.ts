// The course of a companion through review, invitations by e-mail, and the account e-mail links.
// Checks behaviour against the product's own rules; the e-mail is read back from the SMTP fake.
import { describe, expect, it } from 'vitest'
import { ApiClient, planeSetting, signUp, uniqueCsv, uniqueName, withDatabase } from '../support/http'
import type { TestAccount } from '../support/http'
import { invitationToken, linkIn, mailTo, waitForMail } from '../support/mail'
import { startRunner } from '../support/runner'

async function companionWith(roles: Array<'author' | 'reviewer' | 'reader'>) {
  const editor = await signUp('course-editor')
  const slug = uniqueName('course-')
  expect((await editor.client.post('/api/companions', { title: 'Screened plasmas at low temperature', slug })).status).toBe(201)
  const members: Record<string, TestAccount> = {}
  for (const role of roles) {
    members[role] = await signUp(`course-${role}`)
    expect((await editor.client.post(`/api/companions/${slug}/members`, { email: members[role]!.email, role })).status).toBe(201)
  }
  return { editor, slug, members }
}

describe('the course of a companion', () => {
  it('goes draft → in review → revising → in review → accepted → published, each move by its role and with its reason', async () => {
    const { editor, slug, members } = await companionWith(['author', 'reviewer'])
    const author = members.author!
    const reviewer = members.reviewer!
    const move = (who: TestAccount, to: string, reason = `moving to ${to}`) => who.client.post<{ state: string, message?: string }>(`/api/companions/${slug}/state`, { to, reason })

    expect((await author.client.upload(`/api/companions/${slug}/ensembles`, planeSetting('first'), 'first.csv', uniqueCsv())).status).toBe(201)
    expect((await move(reviewer, 'in_review')).status).toBe(403)
    const noReason = await author.client.post<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/state`, { to: 'in_review', reason: '' })
    expect(noReason.status).toBe(422)
    expect(noReason.body.data.fields.reason).toMatch(/reason/i)
    expect((await move(author, 'in_review', 'Ready for the referees')).body.state).toBe('in_review')
    // Only the editor asks for a revision or accepts.
    expect((await move(author, 'accepted')).status).toBe(403)
    expect((await move(editor, 'revising', 'Answer the remark on figure 1')).status).toBe(200)
    expect((await move(author, 'in_review', 'Corrected ensemble uploaded')).status).toBe(200)
    expect((await move(editor, 'accepted', 'Both reviewers are satisfied')).status).toBe(200)
    // Accepted: authors no longer change data; the editor still may.
    const upload = await author.client.upload(`/api/companions/${slug}/ensembles`, planeSetting('late'), 'late.csv', uniqueCsv())
    expect(upload.status).toBe(409)
    expect(JSON.stringify(upload.body)).toMatch(/accepted/)
    // No move skips a state.
    const skip = await move(editor, 'draft')
    expect(skip.status).toBe(409)
    expect(skip.body.message).toMatch(/cannot become draft/)

    // Before publication the public does not see it; after, it does.
    expect((await new ApiClient().get(`/api/companions/${slug}`)).status).toBe(404)
    const published = await move(editor, 'published', 'Accepted manuscript appeared')
    expect(published.status).toBe(200)
    const open = await new ApiClient().get<{ companion: { state: string, publishedAt: string | null, publishedRevision: string | null } }>(`/api/companions/${slug}`)
    expect(open.status).toBe(200)
    expect(open.body.companion.state).toBe('published')
    expect(open.body.companion.publishedAt).not.toBeNull()
    expect(open.body.companion.publishedRevision).toMatch(/^[0-9a-f]{40}$/)

    // The members were told of each move by e-mail, with the reason.
    const told = await waitForMail(author.email, /now published/)
    expect(told.text).toContain('Accepted manuscript appeared')
    expect(told.html).toContain('Accepted manuscript appeared')

    // The trail: the editor sees every move with its reason, in order; the author only the moves.
    const trail = await editor.client.get<{ events: Array<{ kind: string, toState: string | null, reason: string }> }>(`/api/companions/${slug}/events`)
    const moves = trail.body.events.filter(e => e.kind === 'state').map(e => [e.toState, e.reason]).reverse()
    expect(moves).toEqual([
      ['in_review', 'Ready for the referees'],
      ['revising', 'Answer the remark on figure 1'],
      ['in_review', 'Corrected ensemble uploaded'],
      ['accepted', 'Both reviewers are satisfied'],
      ['published', 'Accepted manuscript appeared'],
    ])
    const authorsTrail = await author.client.get<{ events: Array<{ kind: string }> }>(`/api/companions/${slug}/events`)
    expect(authorsTrail.body.events.every(e => e.kind === 'state')).toBe(true)
    expect((await reviewer.client.get(`/api/companions/${slug}/events`)).status).toBe(403)
  })

  it('withdraws and reinstates, and review settings are audited', async () => {
    const { editor, slug } = await companionWith([])
    expect((await editor.client.post(`/api/companions/${slug}/state`, { to: 'withdrawn', reason: 'Manuscript withdrawn by its authors' })).status).toBe(200)
    expect((await editor.client.post(`/api/companions/${slug}/state`, { to: 'draft', reason: 'Resubmitted elsewhere' })).status).toBe(200)
    const settings = await editor.client.patch<{ identitiesOpen: boolean, changed: string[] }>(`/api/companions/${slug}/review-settings`, { identitiesOpen: true, reason: 'Reviewers agreed to be named' })
    expect(settings.body).toMatchObject({ identitiesOpen: true, changed: ['identitiesOpen'] })
    const noChange = await editor.client.patch(`/api/companions/${slug}/review-settings`, { reason: 'nothing' })
    expect(noChange.status).toBe(422)
    const trail = await editor.client.get<{ events: Array<{ kind: string, reason: string }> }>(`/api/companions/${slug}/events`)
    expect(trail.body.events[0]).toMatchObject({ kind: 'identities', reason: 'Reviewers agreed to be named' })
  })
})

describe('invitations', () => {
  it('arrive by e-mail, work once, need the invited address, and number reviewers', async () => {
    const { editor, slug, members } = await companionWith(['author'])
    const address = `${uniqueName('referee')}@tests.example`
    const sent = await editor.client.post<{ mailed: boolean, invitation: { id: number, status: string } }>(`/api/companions/${slug}/invitations`, { email: address, role: 'reviewer', message: 'Please look at figure 2.' })
    expect(sent.status).toBe(201)
    expect(sent.body).toMatchObject({ mailed: true, invitation: { status: 'waiting' } })
    const mail = await waitForMail(address, /Invitation/)
    expect(mail.text).toContain('Please look at figure 2.')
    expect(mail.html).toContain('/invitations/')
    const token = invitationToken(mail)

    const seen = await new ApiClient().get<{ role: string, status: string, email: string }>(`/api/invitations/${token}`)
    expect(seen.body).toMatchObject({ role: 'reviewer', status: 'waiting', email: address })
    expect((await new ApiClient().post(`/api/invitations/${token}/accept`, {})).status).toBe(401)
    // Someone else holding the link cannot use it.
    const stranger = await signUp('stranger')
    expect((await stranger.client.post(`/api/invitations/${token}/accept`, {})).status).toBe(403)

    const invited = new ApiClient()
    expect((await invited.post('/api/auth/sign-up', { email: address, password: 'a long enough password', displayName: 'Invited Referee' })).status).toBe(201)
    expect((await invited.get<{ verified: boolean }>('/api/account/address')).body.verified).toBe(false)
    const accepted = await invited.post<{ slug: string, role: string }>(`/api/invitations/${token}/accept`, {})
    expect(accepted.body).toEqual({ slug, role: 'reviewer' })
    // Following the link proved the address; the link is spent.
    expect((await invited.get<{ verified: boolean }>('/api/account/address')).body.verified).toBe(true)
    expect((await invited.post(`/api/invitations/${token}/accept`, {})).status).toBe(410)
    const number = await withDatabase(async c => (await c.query('SELECT m.reviewer_number AS n FROM membership m JOIN user u ON u.id = m.user_id WHERE u.email = ?', [address]))[0] as Array<{ n: number }>)
    expect(number[0]!.n).toBe(1)

    const list = await editor.client.get<{ invitations: Array<{ email: string, status: string }> }>(`/api/companions/${slug}/invitations`)
    expect(list.body.invitations.find(i => i.email === address)?.status).toBe('accepted')
    // Members are not invited again.
    const again = await editor.client.post<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/invitations`, { email: members.author!.email, role: 'author' })
    expect(again.status).toBe(409)
    expect(again.body.data.fields.email).toMatch(/already a member/i)
  })

  it('stop working when withdrawn, replaced or expired', async () => {
    const { editor, slug } = await companionWith([])
    const address = `${uniqueName('late')}@tests.example`
    const first = await editor.client.post<{ invitation: { id: number } }>(`/api/companions/${slug}/invitations`, { email: address, role: 'reader' })
    const firstToken = invitationToken(await waitForMail(address, /Invitation/))
    // A second invitation to the same address replaces the first.
    await editor.client.post(`/api/companions/${slug}/invitations`, { email: address, role: 'author' })
    const messages = async () => (await mailTo(address)).filter(m => /Invitation/.test(m.subject))
    for (let i = 0; i < 50 && (await messages()).length < 2; i++) await new Promise(resolve => setTimeout(resolve, 100))
    const secondToken = invitationToken((await messages())[0]!)
    expect(secondToken).not.toBe(firstToken)
    const person = new ApiClient()
    await person.post('/api/auth/sign-up', { email: address, password: 'a long enough password', displayName: 'Late Person' })
    expect((await person.post(`/api/invitations/${firstToken}/accept`, {})).status).toBe(410)
    expect((await new ApiClient().get<{ status: string }>(`/api/invitations/${firstToken}`)).body.status).toBe('revoked')
    // Withdrawing a replaced invitation is refused; an expired one cannot be accepted.
    expect((await editor.client.delete(`/api/companions/${slug}/invitations/${first.body.invitation.id}`)).status).toBe(409)
    await withDatabase(c => c.query('UPDATE invitation SET expires_at = NOW() - INTERVAL 1 MINUTE WHERE email = ? AND revoked_at IS NULL', [address]))
    const expired = await person.post<{ message: string }>(`/api/invitations/${secondToken}/accept`, {})
    expect(expired.status).toBe(410)
    expect(expired.body.message).toMatch(/expired/)
    // A malformed link is a 404 (bad params), an unknown one too.
    expect((await new ApiClient().get('/api/invitations/short')).status).toBe(404)
    expect((await new ApiClient().get(`/api/invitations/${'A'.repeat(43)}`)).status).toBe(404)
  })
})

describe('account e-mail links', () => {
  it('resets a password once, signs out other sessions, and answers alike for unknown addresses', async () => {
    const person = await signUp('forgetful')
    const asked = await new ApiClient().post<{ message: string }>('/api/auth/password-reset', { email: person.email })
    const unknown = await new ApiClient().post<{ message: string }>('/api/auth/password-reset', { email: `${uniqueName('nobody')}@tests.example` })
    expect(asked.status).toBe(202)
    expect(unknown.status).toBe(202)
    expect(unknown.body.message).toBe(asked.body.message)
    const link = linkIn(await waitForMail(person.email, /new Quillfield password/), '/reset-password?token=')
    const token = new URL(link).searchParams.get('token')!
    const weak = await new ApiClient().post<{ data: { fields: Record<string, string> } }>('/api/auth/password-reset/confirm', { token, password: 'short' })
    expect(weak.status).toBe(422)
    expect(weak.body.data.fields.password).toMatch(/10 characters/)
    const fresh = new ApiClient()
    expect((await fresh.post('/api/auth/password-reset/confirm', { token, password: 'a brand new passphrase' })).status).toBe(200)
    expect((await fresh.get<{ account: { id: string } | null }>('/api/auth/session')).body.account?.id).toBe(person.id)
    // The old session ended; the old password no longer works; the link is spent.
    expect((await person.client.get<{ account: unknown }>('/api/auth/session')).body.account).toBeNull()
    expect((await new ApiClient().post('/api/auth/sign-in', { email: person.email, password: person.password })).status).toBe(401)
    expect((await new ApiClient().post('/api/auth/sign-in', { email: person.email, password: 'a brand new passphrase' })).status).toBe(200)
    expect((await new ApiClient().post('/api/auth/password-reset/confirm', { token, password: 'another new passphrase' })).status).toBe(410)
  })

  it('confirms the address with the link sent at sign-up', async () => {
    const person = await signUp('confirming')
    const link = linkIn(await waitForMail(person.email, /Confirm your address/), '/verify-email?token=')
    expect((await person.client.get<{ verified: boolean }>('/api/account/address')).body.verified).toBe(false)
    expect((await new ApiClient().post('/api/auth/verify-email', { token: new URL(link).searchParams.get('token') })).status).toBe(200)
    expect((await person.client.get<{ verified: boolean }>('/api/account/address')).body.verified).toBe(true)
  })

  it('lets a confirmed account join from the desk an invitation to its address', async () => {
    const { editor, slug } = await companionWith([])
    const person = await signUp('desk-joiner')
    await editor.client.post(`/api/companions/${slug}/invitations`, { email: person.email, role: 'reader' })
    const waiting = await person.client.get<{ invitations: Array<{ id: number, companion: { slug: string } }> }>('/api/account/invitations')
    const invitation = waiting.body.invitations.find(i => i.companion.slug === slug)!
    expect((await person.client.post(`/api/account/invitations/${invitation.id}/accept`, {})).status).toBe(403)
    const link = linkIn(await waitForMail(person.email, /Confirm your address/), '/verify-email?token=')
    await new ApiClient().post('/api/auth/verify-email', { token: new URL(link).searchParams.get('token') })
    expect((await person.client.post(`/api/account/invitations/${invitation.id}/accept`, {})).body).toEqual({ slug, role: 'reader' })
  })
})

describe('a corrected ensemble', () => {
  it('replaces the data as one revision and the computations over it run again', async () => {
    const runner = await startRunner()
    try {
      const { slug, members } = await companionWith(['author'])
      const author = members.author!
      // Two points at distance 1, then at distance 2: the pair sum Σ_{i<j} −log|x_i − x_j| goes from
      // 0 to −log 2 (the log kernel g(x) = −log|x|; common practice for the two-dimensional log-gas).
      const first = await author.client.upload<{ id: number, revision: string }>(`/api/companions/${slug}/ensembles`, planeSetting('pair'), 'pair.csv', 'x,y\n0,0\n1,0\n')
      expect(first.status).toBe(201)
      const made = await author.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'energy', quantity: 'energy', ensembleIds: [first.body.id], parameters: {} })
      const pairSum = async () => {
        for (let i = 0; i < 300; i++) {
          const c = await author.client.get<{ computation: { status: string }, result: { table: { rows: Array<Record<string, number>> } } | null }>(`/api/companions/${slug}/computations/${made.body.id}`)
          if (c.body.computation.status === 'current' && c.body.result) return c.body.result.table.rows[0]!.pairSum
          await new Promise(resolve => setTimeout(resolve, 200))
        }
        throw new Error('the computation did not finish')
      }
      expect(await pairSum()).toBeCloseTo(0, 12)
      const bad = await author.client.upload<{ message: string, data: { where: Record<string, unknown> } }>(`/api/companions/${slug}/ensembles/${first.body.id}/file`, {}, 'broken.csv', 'x,y\n0,0\n2\n')
      expect(bad.status).toBe(422)
      expect(bad.body.data.where).toMatchObject({ line: 3 })
      const replaced = await author.client.upload<{ revision: string, requeued: number }>(`/api/companions/${slug}/ensembles/${first.body.id}/file`, {}, 'pair-corrected.csv', 'x,y\n0,0\n2,0\n')
      expect(replaced.status).toBe(200)
      expect(replaced.body.revision).not.toBe(first.body.revision)
      expect(replaced.body.requeued).toBe(1)
      expect(await pairSum()).toBeCloseTo(-Math.log(2), 12)
      const revisions = await author.client.get<{ revisions: Array<{ message: string }> }>(`/api/companions/${slug}/revisions`)
      expect(revisions.body.revisions[0]!.message).toMatch(/Replace the data of ensemble «pair» with pair-corrected\.csv/)
    }
    finally {
      await runner.stop()
    }
  })
})
