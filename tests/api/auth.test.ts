import { describe, expect, it } from 'vitest'
import { ApiClient, signUp, uniqueName } from '../support/http'

describe('accounts and sessions', () => {
  it('signs up, reads the session, signs out and back in', async () => {
    const { client, email, password } = await signUp('cycle')
    const me = await client.get<{ account: { email: string, siteRole: string } }>('/api/auth/session')
    expect(me.body.account.email).toBe(email)
    expect(me.body.account.siteRole).toBe('member')

    expect((await client.post('/api/auth/sign-out')).status).toBe(204)
    expect(client.cookie).toBe('')
    expect((await client.get<{ account: null }>('/api/auth/session')).body.account).toBeNull()
    expect((await client.get('/api/account')).status).toBe(401)

    expect((await client.post('/api/auth/sign-in', { email: email.toUpperCase(), password })).status).toBe(200)
    expect((await client.get('/api/account')).status).toBe(200)
  })

  it('sets the session cookie HttpOnly and SameSite=Lax', async () => {
    const client = new ApiClient()
    const reply = await client.post('/api/auth/sign-up', { email: `${uniqueName('cookie')}@tests.example`, password: 'a long enough password', displayName: 'Cookie check' })
    const cookie = reply.headers.getSetCookie().find(c => c.startsWith('qf_session='))
    expect(cookie).toBeDefined()
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
  })

  it('invalidates the session on the server at sign-out', async () => {
    const { client } = await signUp('revoke')
    const stolen = client.cookie
    await client.post('/api/auth/sign-out')
    const thief = new ApiClient()
    thief.cookie = stolen
    expect((await thief.get('/api/account')).status).toBe(401)
  })

  it('answers field by field when the sign-up form is invalid', async () => {
    const reply = await new ApiClient().post<{ data: { fields: Record<string, string> } }>('/api/auth/sign-up', { email: 'not-an-address', password: 'short', displayName: '' })
    expect(reply.status).toBe(422)
    expect(Object.keys(reply.body.data.fields).sort()).toEqual(['displayName', 'email', 'password'])
  })

  it('gives the same refusal for a wrong password and for an unknown account', async () => {
    const { email } = await signUp('generic')
    const wrongPassword = await new ApiClient().post<{ statusMessage: string }>('/api/auth/sign-in', { email, password: 'not the password at all' })
    const noAccount = await new ApiClient().post<{ statusMessage: string }>('/api/auth/sign-in', { email: `${uniqueName('nobody')}@tests.example`, password: 'not the password at all' })
    expect(wrongPassword.status).toBe(401)
    expect(noAccount.status).toBe(401)
    expect(noAccount.body.statusMessage).toBe(wrongPassword.body.statusMessage)
  })

  it('locks an account after repeated failures, from any address, with a clear message', async () => {
    const { email, password } = await signUp('locked')
    // The test server allows 5 failures per account in a window (the default configuration).
    for (let i = 0; i < 5; i++) {
      const reply = await new ApiClient().post('/api/auth/sign-in', { email, password: 'wrong wrong wrong' })
      expect(reply.status).toBe(401)
    }
    const blocked = await new ApiClient().post<{ statusMessage: string }>('/api/auth/sign-in', { email, password })
    expect(blocked.status).toBe(429)
    expect(blocked.body.statusMessage).toMatch(/too many failed sign-in attempts/i)
    expect(Number(blocked.headers.get('retry-after'))).toBeGreaterThan(0)
  })

  it('limits failures per address across accounts', async () => {
    const attacker = new ApiClient()
    let status = 0
    // 30 failures per address (the default); the 31st attempt is refused whatever the account.
    for (let i = 0; i < 31; i++) {
      status = (await attacker.post('/api/auth/sign-in', { email: `${uniqueName('spray')}@tests.example`, password: 'guess guess guess' })).status
    }
    expect(status).toBe(429)
    const { email, password } = await signUp('elsewhere')
    expect((await new ApiClient().post('/api/auth/sign-in', { email, password })).status).toBe(200)
  })

  it('refuses state-changing requests from another origin or without one', async () => {
    const { client } = await signUp('origin')
    const foreign = await client.request('PATCH', '/api/account', { displayName: 'x', affiliation: '', orcid: '' }, { origin: 'http://elsewhere.example' })
    expect(foreign.status).toBe(403)
    const none = await client.request('PATCH', '/api/account', { displayName: 'x', affiliation: '', orcid: '' }, { origin: null })
    expect(none.status).toBe(403)
  })

  it('stores a profile and checks the researcher identifier', async () => {
    const { client } = await signUp('profile')
    // A check digit computed by ISO/IEC 7064 MOD 11-2 (see tests/unit/orcid.test.ts).
    const good = await client.patch('/api/account', { displayName: 'Ada Test', affiliation: 'Invented Institute', orcid: '0000-0002-1825-0097' })
    expect(good.status).toBe(200)
    const me = await client.get<{ account: { displayName: string, affiliation: string, orcid: string } }>('/api/account')
    expect(me.body.account).toMatchObject({ displayName: 'Ada Test', affiliation: 'Invented Institute', orcid: '0000-0002-1825-0097' })
    const bad = await client.patch<{ data: { fields: Record<string, string> } }>('/api/account', { displayName: 'Ada Test', affiliation: '', orcid: '0000-0002-1825-0098' })
    expect(bad.status).toBe(422)
    expect(bad.body.data.fields.orcid).toMatch(/check digit/)
  })

  it('does not make a second account with the same address', async () => {
    const { email } = await signUp('twice')
    const reply = await new ApiClient().post('/api/auth/sign-up', { email, password: 'another long password', displayName: 'Twice' })
    expect(reply.status).toBe(409)
  })
})
