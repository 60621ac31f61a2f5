// Computations end to end: queued in MariaDB, run by the server's runner in a worker thread,
// results stored by input hash; compared with the engine's command line on the same file.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { runEngine } from '../../cli/engine'
import { planeSetting, signUp, uniqueCsv, uniqueName, withDatabase } from '../support/http'
import type { TestAccount } from '../support/http'
import { startRunner } from '../support/runner'
import type { Runner } from '../support/runner'

let author: TestAccount
let slug = ''
let ensembleId = 0
let csv = ''

interface Computation { id: number, status: string, resultId: number | null, error: string | null, inputHash: string }
interface Detail { computation: Computation, result: { id: number, table: { rows: Array<Record<string, number | string | null>>, convention: string, engineVersion: string } } | null }

async function waitFor(id: number, done: (c: Computation) => boolean, seconds = 40): Promise<Detail> {
  for (let i = 0; i < seconds * 5; i++) {
    const reply = await author.client.get<Detail>(`/api/companions/${slug}/computations/${id}`)
    if (done(reply.body.computation)) return reply.body
    await new Promise(resolve => setTimeout(resolve, 200))
  }
  throw new Error(`computation ${id} did not get there in ${seconds} s`)
}
const ended = (c: Computation) => !['queued', 'running'].includes(c.status)

async function create(body: Record<string, unknown>) {
  const reply = await author.client.post<{ id: number, status: string, reused: boolean }>(`/api/companions/${slug}/computations`, body)
  expect(reply.status, JSON.stringify(reply.body)).toBe(201)
  return reply.body
}

let runner: Runner

beforeAll(async () => {
  runner = await startRunner()
  author = await signUp('computer')
  slug = uniqueName('comp-')
  await author.client.post('/api/companions', { title: 'Computation tests', slug })
  csv = uniqueCsv(40)
  const up = await author.client.upload<{ id: number }>(`/api/companions/${slug}/ensembles`, planeSetting('forty points'), 'forty.csv', csv)
  ensembleId = up.body.id
})

describe('computations', () => {
  it('lists the catalogue generated from the engine', async () => {
    const reply = await author.client.get<{ quantities: Array<{ id: string }> }>('/api/catalogue')
    expect(reply.body.quantities.map(q => q.id)).toEqual(expect.arrayContaining(['energy', 'next-order', 'statistic:pair-correlation', 'statistic:spacing']))
  })

  it('computes energies in a worker and agrees with the command line to the last bit', async () => {
    const { id } = await create({ name: 'energies', quantity: 'energy', ensembleIds: [ensembleId], parameters: {} })
    const detail = await waitFor(id, ended)
    expect(detail.computation.status).toBe('current')
    const row = detail.result!.table.rows[0]!
    const cli = await runEngine(['energy', '--input', 'forty.csv', '--potential', 'r^2'], { readFile: () => new TextEncoder().encode(csv), writeFile: () => undefined })
    const expected = JSON.parse(cli.stdout) as { pairSum: number, confinement: number, H: number, method: string }
    // the server's worker loads the native kernels as the command line does, and says so in the row
    expect(row.method).toBe('direct-native')
    expect(row.method).toBe(expected.method)
    expect(row.errorBound).toBe(0)
    expect(row.pairSum).toBe(expected.pairSum)
    expect(row.confinement).toBe(expected.confinement)
    expect(row.H).toBe(expected.H)
    expect(detail.result!.table.convention).toContain('Σ_{i≠j}')
  })

  it('gives log Z of the β = 2 plasma for each configuration, as the command line does (Ginibre 1965)', async () => {
    const { id } = await create({ name: 'log Z', quantity: 'partition', ensembleIds: [ensembleId], parameters: { expansion: false } })
    const detail = await waitFor(id, ended)
    expect(detail.computation.status, detail.computation.error ?? '').toBe('current')
    const cli = await runEngine(['logz', '--ensemble', 'ginibre', '--n', '40', '--beta', '2', '--expansion=false'], { readFile: () => new Uint8Array(), writeFile: () => undefined })
    expect(detail.result!.table.rows[0]!.logZ).toBe((JSON.parse(cli.stdout) as { logZ: number }).logZ)
  })

  it('never computes identical inputs twice', async () => {
    const first = await create({ name: 'next order', quantity: 'next-order', ensembleIds: [ensembleId], parameters: { eta: 'fixed:0.001' } })
    const a = await waitFor(first.id, ended)
    const second = await create({ name: 'next order again', quantity: 'next-order', ensembleIds: [ensembleId], parameters: { eta: 'fixed:0.001' } })
    expect(second.reused).toBe(true)
    expect(second.status).toBe('current')
    const b = await author.client.get<Detail>(`/api/companions/${slug}/computations/${second.id}`)
    expect(b.body.computation.resultId).toBe(a.computation.resultId)
    const rows = await withDatabase(async (c) => {
      const [r] = await c.query('SELECT COUNT(*) AS n FROM computation_result WHERE input_hash = ?', [a.computation.inputHash])
      return Number((r as Array<{ n: number }>)[0]!.n)
    })
    expect(rows).toBe(1)
  })

  it('shows the engine\'s reason when a computation fails', async () => {
    const { id } = await create({ name: 'spacings of planar points', quantity: 'statistic:spacing', ensembleIds: [ensembleId], parameters: {} })
    const detail = await waitFor(id, ended)
    expect(detail.computation.status).toBe('failed')
    expect(detail.computation.error).toMatch(/d = 1|dimension|1-D|one/i)
  })

  it('refuses parameters the quantity does not have, field by field', async () => {
    const reply = await author.client.post<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/computations`, { name: 'x', quantity: 'energy', ensembleIds: [ensembleId], parameters: { bins: 3 } })
    expect(reply.status).toBe(422)
    expect(reply.body.data.fields.bins).toMatch(/no parameter/)
  })

  it('queues the affected computations again when the convention of an ensemble changes', async () => {
    const { id } = await create({ name: 'energies to follow', quantity: 'energy', ensembleIds: [ensembleId], parameters: {} })
    const before = await waitFor(id, ended)
    const patched = await author.client.patch(`/api/companions/${slug}/ensembles/${ensembleId}`, { convention: { pairs: 'half', fieldScale: 1, logSign: 'minus-log', gibbs: 'beta' } })
    expect(patched.status).toBe(200)
    const after = await waitFor(id, c => ended(c) && c.inputHash !== before.computation.inputHash)
    expect(after.computation.status).toBe('current')
    expect(after.computation.resultId).not.toBe(before.computation.resultId)
    const row = after.result!.table.rows[0]!
    // ½Σ_{i≠j} g + Σ V: the declared convention, from the same pair sum and confinement.
    expect(row.Hconv).toBeCloseTo(Number(row.pairSum) + Number(row.confinement), 10)
  })

  it('streams progress as server-sent events until the computation ends', async () => {
    const { id } = await create({ name: 'pair correlation', quantity: 'statistic:pair-correlation', ensembleIds: [ensembleId], parameters: { 'bins': 5, 'window-radius': 0.9 } })
    const response = await fetch(`${process.env.QF_BASE_URL}/api/companions/${slug}/computations/${id}/events`, { headers: { cookie: author.client.cookie } })
    expect(response.headers.get('content-type')).toContain('text/event-stream')
    const text = await response.text()
    const events = text.split('\n').filter(l => l.startsWith('data: ')).map(l => JSON.parse(l.slice(6)) as { status: string })
    expect(events.length).toBeGreaterThan(0)
    expect(['current', 'failed']).toContain(events.at(-1)!.status)
  })

  it('finishes a job after the server running it was killed and started again', async () => {
    const N = 40_000
    const rows = ['x,y']
    for (let i = 0; i < N; i++) rows.push(`${Math.sqrt((i + 0.5) / N) * Math.cos(i * 2.399963229728653)},${Math.sqrt((i + 0.5) / N) * Math.sin(i * 2.399963229728653)}`)
    const up = await author.client.upload<{ id: number }>(`/api/companions/${slug}/ensembles`, planeSetting('large spiral'), 'large.csv', `${rows.join('\n')}\n`)
    expect(up.status).toBe(201)
    // the next-order energy of 40 000 points takes seconds (its pair sum and electric energy are
    // plain TypeScript); the energy itself is now too quick to be caught running
    const { id } = await create({ name: 'a long next-order energy', quantity: 'next-order', ensembleIds: [up.body.id], parameters: {} })
    await waitFor(id, c => c.status === 'running', 30)
    await runner.kill()
    const left = await author.client.get<Detail>(`/api/companions/${slug}/computations/${id}`)
    expect(left.body.computation.status).toBe('running')
    runner = await startRunner()
    const detail = await waitFor(id, c => ended(c), 80)
    expect(detail.computation.status).toBe('current')
    const attempts = await withDatabase(async (c) => {
      const [r] = await c.query('SELECT attempts FROM computation WHERE id = ?', [id])
      return Number((r as Array<{ attempts: number }>)[0]!.attempts)
    })
    expect(attempts).toBe(2)
    expect(detail.result!.table.rows[0]!.N).toBe(N)
  }, 120_000)

  it('cancels a queued computation', async () => {
    await withDatabase(c => c.query('UPDATE computation SET status = ? WHERE status = ? AND companion_id = (SELECT id FROM companion WHERE slug = ?)', ['cancelled', 'queued', slug]))
    const { id } = await create({ name: 'to cancel', quantity: 'statistic:nn', ensembleIds: [ensembleId], parameters: { 'window-radius': 0.95, 'replicates': 50 } })
    const cancelled = await author.client.post(`/api/companions/${slug}/computations/${id}/cancel`)
    // It may already have finished on a fast machine; then cancelling is refused with 409.
    expect([200, 409]).toContain(cancelled.status)
    const detail = await waitFor(id, ended)
    expect(cancelled.status === 200 ? 'cancelled' : 'current').toBe(detail.computation.status)
  })
})

afterAll(async () => {
  await runner?.stop()
})
