// Figures end to end: a computation's result drawn with one of our templates, its status, and the
// server's SVG, PNG and column-sized SVG.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { planeSetting, signUp, uniqueName } from '../support/http'
import type { TestAccount } from '../support/http'
import { startRunner } from '../support/runner'
import type { Runner } from '../support/runner'

let author: TestAccount
let slug = ''
let gId = 0
let energyId = 0

async function untilEnded(id: number) {
  for (let i = 0; i < 200; i++) {
    const reply = await author.client.get<{ computation: { status: string } }>(`/api/companions/${slug}/computations/${id}`)
    if (!['queued', 'running'].includes(reply.body.computation.status)) return reply.body.computation.status
    await new Promise(resolve => setTimeout(resolve, 200))
  }
  throw new Error('the computation did not end')
}

/** Points on a golden-angle spiral filling the unit disk: evenly spread, no two alike. */
function spiral(N: number): string {
  const rows = ['x,y']
  for (let i = 0; i < N; i++) {
    const r = Math.sqrt((i + 0.5) / N)
    rows.push(`${r * Math.cos(i * 2.399963229728653)},${r * Math.sin(i * 2.399963229728653)}`)
  }
  return `${rows.join('\n')}\n`
}

let runner: Runner

beforeAll(async () => {
  runner = await startRunner()
  author = await signUp('figures')
  slug = uniqueName('fig-')
  await author.client.post('/api/companions', { title: 'Figure tests', slug })
  const up = await author.client.upload<{ id: number }>(`/api/companions/${slug}/ensembles`, planeSetting('spiral'), 'spiral.csv', spiral(400))
  const g = await author.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'g(r)', quantity: 'statistic:pair-correlation', ensembleIds: [up.body.id], parameters: { 'window-radius': 0.9, 'bins': 8, 'rmax': 0.2 } })
  gId = g.body.id
  const e = await author.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'energy', quantity: 'energy', ensembleIds: [up.body.id], parameters: {} })
  energyId = e.body.id
  expect(await untilEnded(gId)).toBe('current')
  await untilEnded(energyId)
})

describe('figures', () => {
  it('lists our templates with the quantities they draw', async () => {
    const reply = await author.client.get<{ templates: Array<{ id: string, quantities: string[] }> }>('/api/figure-templates')
    expect(reply.body.templates.find(t => t.id === 'pair-correlation')!.quantities).toContain('statistic:pair-correlation')
  })

  it('draws a pair correlation from its computation, numbered in the companion, with status current', async () => {
    const made = await author.client.post<{ number: number }>(`/api/companions/${slug}/figures`, { title: 'Pair correlation of the spiral', template: 'pair-correlation', computationIds: [gId], caption: 'g(r) in the bulk.' })
    expect(made.status).toBe(201)
    expect(made.body.number).toBe(1)
    const figure = await author.client.get<{ status: { word: string }, spec: { description: string, data: { values: unknown[] } } | null, tables: Array<{ rows: unknown[], convention: string }> }>(`/api/companions/${slug}/figures/1`)
    expect(figure.body.status.word).toBe('current')
    expect(figure.body.spec).not.toBeNull()
    expect(figure.body.tables[0]!.rows).toHaveLength(8)
    expect(figure.body.spec!.description).toContain('Convention')
  })

  it('renders the figure on the server as SVG, PNG and column-sized SVG', async () => {
    const get = (format: string) => fetch(`${process.env.QF_BASE_URL}/files/${slug}/figures/1?format=${format}`, { headers: { cookie: author.client.cookie } })
    const svg = await get('svg')
    expect(svg.headers.get('content-type')).toContain('image/svg+xml')
    expect(await svg.text()).toMatch(/^<svg/)
    const png = new Uint8Array(await (await get('png')).arrayBuffer())
    // The PNG signature (ISO/IEC 15948, §5.2).
    expect(Array.from(png.slice(0, 8))).toEqual([137, 80, 78, 71, 13, 10, 26, 10])
    expect(await (await get('single')).text()).toContain('width="252pt"')
    expect(await (await get('double')).text()).toContain('width="504pt"')
  })

  it('refuses a template that does not draw the computation\'s quantity', async () => {
    const reply = await author.client.post<{ message: string }>(`/api/companions/${slug}/figures`, { title: 'Wrong', template: 'spacing-surmise', computationIds: [gId] })
    expect(reply.status).toBe(422)
    expect(reply.body.message).toContain('statistic:spacing')
  })

  it('numbers the next figure 2 and lists both with their status', async () => {
    await author.client.post(`/api/companions/${slug}/figures`, { title: 'Again', template: 'pair-correlation', computationIds: [gId] })
    const list = await author.client.get<{ figures: Array<{ number: number, status: { word: string } }> }>(`/api/companions/${slug}/figures`)
    expect(list.body.figures.map(f => f.number)).toEqual([1, 2])
    expect(list.body.figures.every(f => f.status.word === 'current')).toBe(true)
  })
})

describe('declared values', () => {
  it('compares declared values with the recomputed ones within the stated tolerance, and the figure says drifted when they differ', async () => {
    const detail = await author.client.get<{ result: { table: { rows: Array<{ g: number }> } } }>(`/api/companions/${slug}/computations/${gId}`)
    const g = detail.body.result.table.rows.map(r => r.g)
    const same = await author.client.request('PUT', `/api/companions/${slug}/computations/${gId}/declared`, { column: 'g', values: g, relativeTolerance: 1e-9, absoluteTolerance: 1e-12, source: 'Table 1' })
    expect(same.status).toBe(200)
    const agree = await author.client.get<{ comparison: { verdict: string, tolerance: string } }>(`/api/companions/${slug}/computations/${gId}`)
    expect(agree.body.comparison.verdict).toBe('agree')
    expect(agree.body.comparison.tolerance).toContain('1e-9')
    expect((await author.client.get<{ status: { word: string } }>(`/api/companions/${slug}/figures/1`)).body.status.word).toBe('current')

    // One value off by one part in a thousand, with a tolerance of one part in a million.
    const changed = g.map((v, i) => (i === 4 ? v * (1 + 1e-3) : v))
    await author.client.request('PUT', `/api/companions/${slug}/computations/${gId}/declared`, { column: 'g', values: changed, relativeTolerance: 1e-6, absoluteTolerance: 0 })
    const differ = await author.client.get<{ comparison: { verdict: string, differing: number, rows: Array<{ agrees: boolean | null }> } }>(`/api/companions/${slug}/computations/${gId}`)
    expect(differ.body.comparison.verdict).toBe('differ')
    expect(differ.body.comparison.differing).toBe(1)
    expect(differ.body.comparison.rows[4]!.agrees).toBe(false)
    const figure = await author.client.get<{ status: { word: string, detail: string } }>(`/api/companions/${slug}/figures/1`)
    expect(figure.body.status.word).toBe('drifted')
    expect(figure.body.status.detail).toContain('1 of 8')
  })

  it('refuses a negative tolerance, on its field', async () => {
    const reply = await author.client.request<{ data: { fields: Record<string, string> } }>('PUT', `/api/companions/${slug}/computations/${gId}/declared`, { column: 'g', values: [1], relativeTolerance: -1 })
    expect(reply.status).toBe(422)
    expect(reply.body.data.fields.relativeTolerance).toBeDefined()
  })
})

describe('figures across revisions', () => {
  it('records computations and figures in the revisions, and overlays a figure from an earlier revision on the current one', async () => {
    const history = await author.client.get<{ revisions: Array<{ oid: string, message: string }> }>(`/api/companions/${slug}/revisions`)
    const withFigure = history.body.revisions.find(r => r.message.startsWith('Add figure 1'))!
    expect(withFigure).toBeDefined()
    const opened = history.body.revisions.at(-1)!
    const diff = await author.client.get<{ diff: { lines: string[] } }>(`/api/companions/${slug}/revisions/diff?from=${opened.oid}&to=${withFigure.oid}`)
    expect(diff.body.diff.lines.join('\n')).toMatch(/Figure 1 «Pair correlation of the spiral» added/)
    expect(diff.body.diff.lines.join('\n')).toMatch(/Computation \d+ «g\(r\)» added/)

    // Change what the ensemble declares: the computation is queued again and recomputed on the new inputs.
    const list = await author.client.get<{ ensembles: Array<{ id: number }> }>(`/api/companions/${slug}/ensembles`)
    await author.client.patch(`/api/companions/${slug}/ensembles/${list.body.ensembles[0]!.id}`, { labels: { note: 'relabelled' } })
    for (let i = 0; i < 100; i++) {
      const c = await author.client.get<{ computation: { status: string } }>(`/api/companions/${slug}/computations/${gId}`)
      if (c.body.computation.status === 'current') break
      await new Promise(resolve => setTimeout(resolve, 200))
    }
    const overlaid = await author.client.get<{ spec: { data?: { values: Array<{ revision: string }> } } }>(`/api/companions/${slug}/figures/1/overlay?revision=${withFigure.oid}`)
    expect(overlaid.status).toBe(200)
    const labels = new Set(JSON.stringify(overlaid.body.spec).match(/revision [0-9a-f]{8}|"now"/g))
    expect(labels.size).toBe(2)

    const tooEarly = await author.client.get<{ message: string }>(`/api/companions/${slug}/figures/1/overlay?revision=${opened.oid}`)
    expect(tooEarly.status).toBe(409)
    expect(tooEarly.body.message).toMatch(/has no ensemble/)
  })
})

afterAll(async () => {
  await runner?.stop()
})

describe('the figure follows its data', () => {
  it('has an SVG that carries the recomputed values, and goes through queued to current when its ensemble changes', async () => {
    const figure = await author.client.get<{ tables: Array<{ rows: Array<{ r: number, g: number }> }> }>(`/api/companions/${slug}/figures/2`)
    const svg = await (await fetch(`${process.env.QF_BASE_URL}/files/${slug}/figures/2?format=svg`, { headers: { cookie: author.client.cookie } })).text()
    // Vega writes each point's values into its aria-label, to 12 significant digits: every
    // recomputed (r, g) pair is in the SVG.
    const twelve = (v: number) => String(Number(v.toPrecision(12)))
    const drawn = figure.body.tables[0]!.rows.filter(row => row.g > 0)
    expect(drawn.length).toBeGreaterThan(3)
    for (const row of drawn) expect(svg).toContain(`r: ${twelve(row.r)}; g: ${twelve(row.g)};`)
    const list = await author.client.get<{ ensembles: Array<{ id: number }> }>(`/api/companions/${slug}/ensembles`)
    await author.client.patch(`/api/companions/${slug}/ensembles/${list.body.ensembles[0]!.id}`, { labels: { note: 'relabelled again' } })
    const seen: string[] = []
    for (let i = 0; i < 150; i++) {
      const f = await author.client.get<{ status: { word: string } }>(`/api/companions/${slug}/figures/2`)
      if (seen.at(-1) !== f.body.status.word) seen.push(f.body.status.word)
      if (f.body.status.word !== 'queued' && seen.includes('queued')) break
      await new Promise(resolve => setTimeout(resolve, 100))
    }
    // Queued while recomputing, then current — or drifted, since an earlier test declared values that differ.
    expect(seen[0]).toBe('queued')
    expect(['current', 'drifted']).toContain(seen.at(-1))
  })
})

describe('custom figures', () => {
  it('draws the author\'s own Vega-Lite spec with a computation\'s results as its data', async () => {
    const spec = { mark: 'point', data: { name: `computation-${gId}` }, encoding: { x: { field: 'r', type: 'quantitative' }, y: { field: 'g', type: 'quantitative' } } }
    const made = await author.client.post<{ number: number }>(`/api/companions/${slug}/figures`, { title: 'My own view', template: 'custom', computationIds: [gId], spec })
    expect(made.status).toBe(201)
    const figure = await author.client.get<{ spec: { data: { values: Array<{ g: number }> }, description: string }, tables: Array<{ rows: Array<{ g: number }> }> }>(`/api/companions/${slug}/figures/${made.body.number}`)
    expect(figure.body.spec.data.values).toEqual(figure.body.tables[0]!.rows)
    expect(figure.body.spec.description).toContain('Convention')
    const svg = await (await fetch(`${process.env.QF_BASE_URL}/files/${slug}/figures/${made.body.number}?format=svg`, { headers: { cookie: author.client.cookie } })).text()
    expect(svg).toMatch(/^<svg/)
  })

  it('refuses a spec that would fetch data from elsewhere, or name another computation', async () => {
    const fetching = await author.client.post<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/figures`, { title: 'x', template: 'custom', computationIds: [gId], spec: { mark: 'point', data: { url: 'http://127.0.0.1:1/data.json' } } })
    expect(fetching.status).toBe(422)
    expect(fetching.body.data.fields.spec).toMatch(/url/)
    const other = await author.client.post<{ data: { fields: Record<string, string> } }>(`/api/companions/${slug}/figures`, { title: 'x', template: 'custom', computationIds: [gId], spec: { mark: 'point', data: { name: 'computation-999999' } } })
    expect(other.status).toBe(422)
    expect(other.body.data.fields.spec).toMatch(/not one of/)
  })
})
