// Every API route × every role, with the status each must get. A route added to server/api
// without a row here fails the coverage check at the bottom.
import { readdirSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, makeAdmin, planeSetting, signUp, uniqueCsv, uniqueName } from '../support/http'
import type { TestAccount } from '../support/http'
import { invitationToken, waitForMail } from '../support/mail'
import { startRunner } from '../support/runner'
import type { Runner } from '../support/runner'

const roles = ['anonymous', 'member', 'reader', 'reviewer', 'author', 'editor', 'admin'] as const
type Role = typeof roles[number]

interface Row {
  route: string
  expect: Record<Role, number>
  call: (as: Role) => Promise<number>
}

const accounts = {} as Record<Exclude<Role, 'anonymous'>, TestAccount>
let slug = ''
let ensembleId = 0
let firstRevision = ''
let lastRevision = ''
let computationId = 0
let figureRevision = ''

function clientFor(as: Role): ApiClient {
  if (as === 'anonymous') return new ApiClient()
  const probe = new ApiClient(accounts[as].client.address)
  probe.cookie = accounts[as].client.cookie
  return probe
}

async function status(as: Role, method: string, path: string, body?: unknown): Promise<number> {
  return (await clientFor(as).request(method, path, body, { keepCookie: false })).status
}

/** A fresh account added to the fixture companion by its editor, to be changed or removed. */
async function throwawayMember(): Promise<TestAccount> {
  const person = await signUp('throwaway')
  const reply = await accounts.editor.client.post(`/api/companions/${slug}/members`, { email: person.email, role: 'reader' })
  if (reply.status !== 201) throw new Error(`could not add a throwaway member: ${reply.status}`)
  return person
}

/** A fresh ensemble uploaded by the fixture's editor, to be changed or removed. */
async function throwawayEnsemble(): Promise<number> {
  const reply = await accounts.editor.client.upload<{ id: number }>(`/api/companions/${slug}/ensembles`, planeSetting('throwaway'), 'throwaway.csv', uniqueCsv())
  if (reply.status !== 201) throw new Error(`could not upload a throwaway ensemble: ${reply.status} ${JSON.stringify(reply.body)}`)
  return reply.body.id
}

/** A token made by the role under test where it may make one, else by the editor. */
async function tokenToRevoke(as: Role): Promise<number> {
  const maker = as === 'author' || as === 'editor' || as === 'admin' ? accounts[as] : accounts.editor
  const reply = await maker.client.post<{ token: { id: number } }>(`/api/companions/${slug}/tokens`, { name: 'to revoke', scopes: ['ensembles:read'] })
  if (reply.status !== 201) throw new Error(`could not make a token: ${reply.status}`)
  return reply.body.token.id
}

const all = (code: number): Record<Role, number> => Object.fromEntries(roles.map(r => [r, code])) as Record<Role, number>
const signedIn = (code: number) => ({ ...all(code), anonymous: 401 })
const editorsOnly = (code: number) => ({ anonymous: 404, member: 404, reader: 403, reviewer: 403, author: 403, editor: code, admin: code })
const adminsOnly = (code: number) => ({ ...all(403), anonymous: 401, admin: code })
const readers = (code: number) => ({ anonymous: 404, member: 404, reader: code, reviewer: code, author: code, editor: code, admin: code })
const authors = (code: number) => ({ anonymous: 404, member: 404, reader: 403, reviewer: 403, author: code, editor: code, admin: code })

const rows: Row[] = [
  { route: 'GET /api/health', expect: all(200), call: as => status(as, 'GET', '/api/health') },
  { route: 'GET /api/auth/session', expect: all(200), call: as => status(as, 'GET', '/api/auth/session') },
  {
    route: 'POST /api/auth/sign-up',
    expect: all(201),
    call: as => status(as, 'POST', '/api/auth/sign-up', { email: `${uniqueName('matrix')}@tests.example`, password: 'a long enough password', displayName: 'Matrix' }),
  },
  {
    route: 'POST /api/auth/sign-in',
    expect: all(200),
    call: async (as) => {
      const target = await signUp('signin')
      return status(as, 'POST', '/api/auth/sign-in', { email: target.email, password: target.password })
    },
  },
  {
    route: 'POST /api/auth/sign-out',
    expect: { ...all(204), anonymous: 401 },
    call: async (as) => {
      if (as === 'anonymous') return status(as, 'POST', '/api/auth/sign-out')
      // Sign out a second session of the same account, so the matrix keeps its own.
      const second = new ApiClient()
      await second.post('/api/auth/sign-in', { email: accounts[as].email, password: accounts[as].password })
      return (await second.request('POST', '/api/auth/sign-out', {}, { keepCookie: false })).status
    },
  },
  { route: 'GET /api/account', expect: signedIn(200), call: as => status(as, 'GET', '/api/account') },
  { route: 'PATCH /api/account', expect: signedIn(200), call: as => status(as, 'PATCH', '/api/account', { displayName: `Matrix ${as}`, affiliation: '', orcid: '' }) },
  { route: 'GET /api/companions', expect: all(200), call: as => status(as, 'GET', '/api/companions') },
  {
    route: 'POST /api/companions',
    expect: signedIn(201),
    call: as => status(as, 'POST', '/api/companions', { title: `Made by ${as}`, slug: uniqueName('matrix-') }),
  },
  {
    route: 'GET /api/companions/[slug]',
    expect: { anonymous: 404, member: 404, reader: 200, reviewer: 200, author: 200, editor: 200, admin: 200 },
    call: as => status(as, 'GET', `/api/companions/${slug}`),
  },
  { route: 'PATCH /api/companions/[slug]', expect: editorsOnly(200), call: as => status(as, 'PATCH', `/api/companions/${slug}`, { abstract: `Edited by ${as}` }) },
  { route: 'GET /api/companions/[slug]/members', expect: editorsOnly(200), call: as => status(as, 'GET', `/api/companions/${slug}/members`) },
  {
    route: 'POST /api/companions/[slug]/members',
    expect: editorsOnly(201),
    call: async (as) => {
      const person = await signUp('invitee')
      return status(as, 'POST', `/api/companions/${slug}/members`, { email: person.email, role: 'reader' })
    },
  },
  {
    route: 'PATCH /api/companions/[slug]/members/[userId]',
    expect: editorsOnly(200),
    call: async as => status(as, 'PATCH', `/api/companions/${slug}/members/${(await throwawayMember()).id}`, { role: 'reviewer' }),
  },
  {
    route: 'DELETE /api/companions/[slug]/members/[userId]',
    expect: editorsOnly(204),
    call: async as => status(as, 'DELETE', `/api/companions/${slug}/members/${(await throwawayMember()).id}`),
  },
  { route: 'GET /api/companions/[slug]/ensembles', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/ensembles`) },
  {
    route: 'POST /api/companions/[slug]/ensembles',
    expect: authors(201),
    call: async as => (await clientFor(as).upload(`/api/companions/${slug}/ensembles`, planeSetting(`by ${as}`), 'matrix.csv', uniqueCsv())).status,
  },
  { route: 'GET /api/companions/[slug]/ensembles/[id]', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/ensembles/${ensembleId}`) },
  { route: 'PATCH /api/companions/[slug]/ensembles/[id]', expect: authors(200), call: as => status(as, 'PATCH', `/api/companions/${slug}/ensembles/${ensembleId}`, { description: `Noted by ${as}` }) },
  { route: 'DELETE /api/companions/[slug]/ensembles/[id]', expect: authors(200), call: async as => status(as, 'DELETE', `/api/companions/${slug}/ensembles/${await throwawayEnsemble()}`) },
  { route: 'GET /api/companions/[slug]/revisions', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/revisions`) },
  { route: 'GET /api/companions/[slug]/revisions/diff', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/revisions/diff?from=${firstRevision}&to=${lastRevision}`) },
  { route: 'POST /api/companions/[slug]/revisions/[oid]/restore', expect: authors(200), call: as => status(as, 'POST', `/api/companions/${slug}/revisions/${lastRevision}/restore`, {}) },
  { route: 'GET /api/companions/[slug]/tokens', expect: authors(200), call: as => status(as, 'GET', `/api/companions/${slug}/tokens`) },
  { route: 'POST /api/companions/[slug]/tokens', expect: authors(201), call: as => status(as, 'POST', `/api/companions/${slug}/tokens`, { name: `made by ${as}`, scopes: ['ensembles:read'] }) },
  { route: 'DELETE /api/companions/[slug]/tokens/[id]', expect: authors(204), call: async as => status(as, 'DELETE', `/api/companions/${slug}/tokens/${await tokenToRevoke(as)}`) },
  { route: 'GET /files/[slug]/ensembles/[id]', expect: readers(200), call: as => status(as, 'GET', `/files/${slug}/ensembles/${ensembleId}?format=csv`) },
  { route: 'GET /files/[slug]/archive', expect: readers(200), call: as => status(as, 'GET', `/files/${slug}/archive`) },
  { route: 'GET /api/catalogue', expect: all(200), call: as => status(as, 'GET', '/api/catalogue') },
  { route: 'GET /api/companions/[slug]/computations', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/computations`) },
  { route: 'POST /api/companions/[slug]/computations', expect: authors(201), call: as => status(as, 'POST', `/api/companions/${slug}/computations`, { name: `by ${as}`, quantity: 'energy', ensembleIds: [ensembleId], parameters: {} }) },
  { route: 'GET /api/companions/[slug]/computations/[id]', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/computations/${computationId}`) },
  { route: 'GET /api/companions/[slug]/computations/[id]/events', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/computations/${computationId}/events`) },
  {
    route: 'POST /api/companions/[slug]/computations/[id]/cancel',
    expect: authors(200),
    call: async (as) => {
      const made = await accounts.editor.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'to cancel', quantity: 'statistic:nn', ensembleIds: [ensembleId], parameters: { 'window-radius': 0.9, 'seed': `${as}-${Math.random()}` } })
      return status(as, 'POST', `/api/companions/${slug}/computations/${made.body.id}/cancel`, {})
    },
  },
  {
    route: 'POST /api/companions/[slug]/computations/[id]/queue',
    expect: authors(200),
    call: async (as) => {
      const made = await accounts.editor.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'to queue again', quantity: 'statistic:nn', ensembleIds: [ensembleId], parameters: { 'window-radius': 0.9, 'seed': `q-${as}-${Math.random()}` } })
      await accounts.editor.client.post(`/api/companions/${slug}/computations/${made.body.id}/cancel`, {})
      return status(as, 'POST', `/api/companions/${slug}/computations/${made.body.id}/queue`, {})
    },
  },
  { route: 'PUT /api/companions/[slug]/computations/[id]/declared', expect: authors(200), call: as => status(as, 'PUT', `/api/companions/${slug}/computations/${computationId}/declared`, { column: 'H', values: [1], relativeTolerance: 1e-6 }) },
  { route: 'GET /api/figure-templates', expect: all(200), call: as => status(as, 'GET', '/api/figure-templates') },
  { route: 'GET /api/companions/[slug]/figures', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/figures`) },
  { route: 'POST /api/companions/[slug]/figures', expect: authors(201), call: as => status(as, 'POST', `/api/companions/${slug}/figures`, { title: `by ${as}`, template: 'energy-expansion', computationIds: [computationId] }) },
  { route: 'GET /api/companions/[slug]/figures/[number]', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/figures/1`) },
  { route: 'GET /api/companions/[slug]/figures/[number]/overlay', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/figures/1/overlay?revision=${figureRevision}`) },
  { route: 'GET /files/[slug]/figures/[number]', expect: readers(200), call: as => status(as, 'GET', `/files/${slug}/figures/1?format=svg`) },
  // rows: companion page (page text, preview)
  ...(() => {
    /** A fresh companion made by the fixture's editor, with the role under test in it, to be written on. */
    async function throwawayCompanionFor(as: Role): Promise<string> {
      const made = uniqueName('matrix-page-')
      const created = await accounts.editor.client.post('/api/companions', { title: 'Page written by the matrix', slug: made })
      if (created.status !== 201) throw new Error(`throwaway companion not created: ${created.status}`)
      if (as === 'reader' || as === 'reviewer' || as === 'author') {
        const added = await accounts.editor.client.post(`/api/companions/${made}/members`, { email: accounts[as].email, role: as })
        if (added.status !== 201) throw new Error(`throwaway member not added: ${added.status}`)
      }
      return made
    }
    const pageRows: Row[] = [
      { route: 'GET /api/companions/[slug]/page', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/page`) },
      { route: 'PUT /api/companions/[slug]/page', expect: authors(200), call: async as => status(as, 'PUT', `/api/companions/${await throwawayCompanionFor(as)}/page`, { text: `Written by ${as}: $x^2$.` }) },
      { route: 'POST /api/companions/[slug]/page/preview', expect: authors(200), call: as => status(as, 'POST', `/api/companions/${slug}/page/preview`, { text: `Previewed by ${as}: $x^2$.` }) },
    ]
    return pageRows
  })(),

  // rows: remarks and notices
  {
    route: 'GET /api/companions/[slug]/remarks',
    expect: { anonymous: 404, member: 404, reader: 403, reviewer: 200, author: 200, editor: 200, admin: 200 },
    call: as => status(as, 'GET', `/api/companions/${slug}/remarks?figure=1`),
  },
  {
    route: 'POST /api/companions/[slug]/remarks',
    expect: { anonymous: 404, member: 404, reader: 403, reviewer: 201, author: 201, editor: 201, admin: 201 },
    call: as => status(as, 'POST', `/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'datum', x: 0.1, y: 1 }, body: `A remark by ${as}` }),
  },
  {
    route: 'GET /api/companions/[slug]/remarks/[id]',
    expect: { anonymous: 404, member: 404, reader: 403, reviewer: 200, author: 200, editor: 200, admin: 200 },
    call: async (as) => {
      const made = await accounts.reviewer.client.post<{ remark: { id: number } }>(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'region', x0: 0.05, x1: 0.1, y0: 0.5, y1: 1.5 }, body: 'A throwaway remark.' })
      return status(as, 'GET', `/api/companions/${slug}/remarks/${made.body.remark.id}`)
    },
  },
  {
    route: 'POST /api/companions/[slug]/remarks/[id]/messages',
    expect: { anonymous: 404, member: 404, reader: 403, reviewer: 201, author: 201, editor: 201, admin: 201 },
    call: async (as) => {
      const made = await accounts.reviewer.client.post<{ remark: { id: number } }>(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'region', x0: 0.05, x1: 0.1, y0: 0.5, y1: 1.5 }, body: 'A throwaway remark.' })
      return status(as, 'POST', `/api/companions/${slug}/remarks/${made.body.remark.id}/messages`, { body: `A reply by ${as}` })
    },
  },
  {
    // Made by the editor: a reviewer who did not write it may not settle it.
    route: 'PATCH /api/companions/[slug]/remarks/[id]',
    expect: { anonymous: 404, member: 404, reader: 403, reviewer: 403, author: 200, editor: 200, admin: 200 },
    call: async (as) => {
      const made = await accounts.editor.client.post<{ remark: { id: number } }>(`/api/companions/${slug}/remarks`, { figureNumber: 1, anchor: { kind: 'region', x0: 0.05, x1: 0.1, y0: 0.5, y1: 1.5 }, body: 'A throwaway remark.' })
      return status(as, 'PATCH', `/api/companions/${slug}/remarks/${made.body.remark.id}`, { state: 'settled' })
    },
  },
  { route: 'POST /api/admin/digests', expect: adminsOnly(200), call: as => status(as, 'POST', '/api/admin/digests', {}) },
  { route: 'POST /api/mail/stop', expect: all(404), call: as => status(as, 'POST', '/api/mail/stop', { key: `no-such-key-${as}` }) },

  // rows: reader view, citations, license
  { route: 'GET /api/published', expect: all(200), call: as => status(as, 'GET', '/api/published?q=plasma&page=1') },
  { route: 'GET /api/companions/[slug]/citation', expect: readers(200), call: as => status(as, 'GET', `/api/companions/${slug}/citation`) },
  { route: 'GET /files/[slug]/cite', expect: readers(200), call: as => status(as, 'GET', `/files/${slug}/cite?format=bibtex`) },
  // The fixture keeps its licence: every call sets the one it already has.
  { route: 'PUT /api/companions/[slug]/license', expect: authors(200), call: as => status(as, 'PUT', `/api/companions/${slug}/license`, { license: 'CC-BY-4.0' }) },

  // rows: review workflow, invitations, audit, accounts mail
  // From draft the course has no move to 'published': those who may move get 409, the rest are refused first.
  { route: 'POST /api/companions/[slug]/state', expect: authors(409), call: as => status(as, 'POST', `/api/companions/${slug}/state`, { to: 'published', reason: 'role matrix probe' }) },
  { route: 'PATCH /api/companions/[slug]/review-settings', expect: editorsOnly(200), call: as => status(as, 'PATCH', `/api/companions/${slug}/review-settings`, { identitiesOpen: false, reason: 'role matrix probe' }) },
  { route: 'GET /api/companions/[slug]/events', expect: authors(200), call: as => status(as, 'GET', `/api/companions/${slug}/events`) },
  { route: 'GET /api/companions/[slug]/invitations', expect: editorsOnly(200), call: as => status(as, 'GET', `/api/companions/${slug}/invitations`) },
  { route: 'POST /api/companions/[slug]/invitations', expect: editorsOnly(201), call: as => status(as, 'POST', `/api/companions/${slug}/invitations`, { email: `${uniqueName('invited')}@tests.example`, role: 'reviewer' }) },
  {
    route: 'DELETE /api/companions/[slug]/invitations/[id]',
    expect: editorsOnly(204),
    call: async (as) => {
      const made = await accounts.editor.client.post<{ invitation: { id: number } }>(`/api/companions/${slug}/invitations`, { email: `${uniqueName('withdrawn')}@tests.example`, role: 'reader' })
      return status(as, 'DELETE', `/api/companions/${slug}/invitations/${made.body.invitation.id}`)
    },
  },
  {
    route: 'GET /api/invitations/[token]',
    expect: all(200),
    call: async (as) => {
      const address = `${uniqueName('link')}@tests.example`
      await accounts.editor.client.post(`/api/companions/${slug}/invitations`, { email: address, role: 'reader' })
      return status(as, 'GET', `/api/invitations/${invitationToken(await waitForMail(address, /Invitation/))}`)
    },
  },
  {
    route: 'POST /api/invitations/[token]/accept',
    expect: { ...all(200), anonymous: 401 },
    call: async (as) => {
      // A companion of a stranger's, inviting the account under test (anonymous: a fresh address).
      const owner = await signUp('inviter')
      const other = uniqueName('matrix-invite-')
      await owner.client.post('/api/companions', { title: 'Invitation probe', slug: other })
      const address = as === 'anonymous' ? `${uniqueName('nobody')}@tests.example` : accounts[as].email
      await owner.client.post(`/api/companions/${other}/invitations`, { email: address, role: 'reader' })
      const mail = await waitForMail(address, new RegExp(`Invitation.*Invitation probe`))
      return status(as, 'POST', `/api/invitations/${invitationToken(mail)}/accept`, {})
    },
  },
  { route: 'GET /api/account/remarks', expect: signedIn(200), call: as => status(as, 'GET', '/api/account/remarks') },
  { route: 'GET /api/account/invitations', expect: signedIn(200), call: as => status(as, 'GET', '/api/account/invitations') },
  { route: 'POST /api/account/invitations/[id]/accept', expect: signedIn(404), call: as => status(as, 'POST', '/api/account/invitations/999999999/accept', {}) },
  { route: 'POST /api/auth/password-reset', expect: all(202), call: as => status(as, 'POST', '/api/auth/password-reset', { email: `${uniqueName('nobody')}@tests.example` }) },
  { route: 'POST /api/auth/password-reset/confirm', expect: all(404), call: as => status(as, 'POST', '/api/auth/password-reset/confirm', { token: 'x'.repeat(43), password: 'a long enough password' }) },
  { route: 'POST /api/auth/verify-email', expect: all(404), call: as => status(as, 'POST', '/api/auth/verify-email', { token: 'y'.repeat(43) }) },
  { route: 'GET /api/account/address', expect: signedIn(200), call: as => status(as, 'GET', '/api/account/address') },
  { route: 'POST /api/account/verification', expect: signedIn(202), call: as => status(as, 'POST', '/api/account/verification', {}) },
  {
    route: 'POST /api/companions/[slug]/ensembles/[id]/file',
    expect: authors(200),
    call: async as => (await clientFor(as).upload(`/api/companions/${slug}/ensembles/${await throwawayEnsemble()}/file`, {}, 'corrected.csv', uniqueCsv())).status,
  },
  { route: 'GET /api/dev/inbox', expect: all(200), call: as => status(as, 'GET', '/api/dev/inbox?to=nobody%40tests.example') },
  { route: 'GET /api/admin/users', expect: adminsOnly(200), call: as => status(as, 'GET', '/api/admin/users') },
  {
    route: 'PATCH /api/admin/users/[id]',
    expect: adminsOnly(200),
    call: async as => status(as, 'PATCH', `/api/admin/users/${(await signUp('promote')).id}`, { siteRole: 'member' }),
  },
]

let runner: Runner

beforeAll(async () => {
  runner = await startRunner()
  for (const role of roles) {
    if (role !== 'anonymous') accounts[role] = await signUp(`matrix-${role}`)
  }
  await makeAdmin(accounts.admin)
  slug = uniqueName('matrix-fixture-')
  const created = await accounts.editor.client.post('/api/companions', { title: 'Role matrix fixture', slug })
  if (created.status !== 201) throw new Error(`fixture companion not created: ${created.status}`)
  for (const role of ['reader', 'reviewer', 'author'] as const) {
    const reply = await accounts.editor.client.post(`/api/companions/${slug}/members`, { email: accounts[role].email, role })
    if (reply.status !== 201) throw new Error(`fixture member ${role} not added: ${reply.status}`)
  }
  const first = await accounts.editor.client.upload<{ id: number, revision: string }>(`/api/companions/${slug}/ensembles`, planeSetting('fixture'), 'fixture.csv', uniqueCsv())
  if (first.status !== 201) throw new Error(`fixture ensemble not stored: ${first.status} ${JSON.stringify(first.body)}`)
  ensembleId = first.body.id
  firstRevision = first.body.revision
  const second = await accounts.editor.client.patch<{ revision: string }>(`/api/companions/${slug}/ensembles/${ensembleId}`, { convention: { pairs: 'half', fieldScale: 1, logSign: 'minus-log', gibbs: 'beta' } })
  lastRevision = second.body.revision
  const computation = await accounts.editor.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'fixture', quantity: 'energy', ensembleIds: [ensembleId], parameters: {} })
  computationId = computation.body.id
  // A drawable figure: the pair correlation of an evenly spread disk of 300 points.
  const rows = ['x,y']
  for (let i = 0; i < 300; i++) rows.push(`${Math.sqrt((i + 0.5) / 300) * Math.cos(i * 2.399963229728653)},${Math.sqrt((i + 0.5) / 300) * Math.sin(i * 2.399963229728653)}`)
  const disk = await accounts.editor.client.upload<{ id: number }>(`/api/companions/${slug}/ensembles`, planeSetting('disk'), 'disk.csv', `${rows.join('\n')}\n`)
  const g = await accounts.editor.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'g', quantity: 'statistic:pair-correlation', ensembleIds: [disk.body.id], parameters: { 'window-radius': 0.9, 'bins': 6, 'rmax': 0.2 } })
  for (let i = 0; i < 200; i++) {
    const c = await accounts.editor.client.get<{ computation: { status: string } }>(`/api/companions/${slug}/computations/${g.body.id}`)
    if (c.body.computation.status === 'current') break
    await new Promise(resolve => setTimeout(resolve, 200))
  }
  const figure = await accounts.editor.client.post(`/api/companions/${slug}/figures`, { title: 'fixture figure', template: 'pair-correlation', computationIds: [g.body.id] })
  if (figure.status !== 201) throw new Error(`fixture figure not made: ${figure.status}`)
  const revisions = await accounts.editor.client.get<{ revisions: Array<{ oid: string }> }>(`/api/companions/${slug}/revisions`)
  figureRevision = revisions.body.revisions[0]!.oid
  // The rows below must find computations still queued (cancel, queue again): no runner from here on.
  await runner.stop()
})

describe('role matrix', () => {
  for (const row of rows) {
    for (const role of roles) {
      it(`${row.route} as ${role} → ${row.expect[role]}`, async () => {
        expect(await row.call(role)).toBe(row.expect[role])
      })
    }
  }
})

function routesOnDisk(dir: string, prefix: string, base = dir): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name)
    if (statSync(path).isDirectory()) return routesOnDisk(path, prefix, base)
    const match = /^(.*)\.(get|post|patch|put|delete)\.ts$/.exec(relative(base, path))
    if (!match) return []
    const route = `${prefix}/${match[1]}`.replace(/\/index$/, '')
    return [`${match[2]!.toUpperCase()} ${route}`]
  })
}

describe('role matrix coverage', () => {
  it('has a row for every route in server/api and server/routes', () => {
    const onDisk = [
      ...routesOnDisk(join(process.cwd(), 'server', 'api'), '/api'),
      ...routesOnDisk(join(process.cwd(), 'server', 'routes'), ''),
    ].sort()
    expect(onDisk.length).toBeGreaterThan(10)
    expect(rows.map(r => r.route).sort()).toEqual(onDisk)
  })
})

afterAll(async () => {
  await runner?.stop()
})
