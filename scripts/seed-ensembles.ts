// The demo's ensembles, made by the engine's own samplers from fixed seeds and uploaded through
// the API as the demo author would (so the demo exercises the real path: worker parsing, object
// storage, revisions). Idempotent: the same seeds give the same bytes, which the server recognises
// as already stored. Usage: tsx scripts/seed-ensembles.ts http://127.0.0.1:3000
import { createRng } from '../shared/physics/random'
import { sampleGinibre } from '../shared/physics/samplers/ginibre'
import { sampleBetaHermite } from '../shared/physics/samplers/beta-ensembles'
import { groundState } from '../shared/physics/minimize/ground-state'
import { writeNpy } from '../shared/physics/formats/npy'
import { writeCsv } from '../shared/physics/formats/write'
import type { PointEnsemble } from '../shared/physics/formats/ensemble'
import type { Configuration } from '../shared/physics/types'
import { demoAccounts, demoCompanion } from './demo-data.mjs'

const base = process.argv[2] ?? 'http://127.0.0.1:3000'
const author = demoAccounts.find(a => a.email === 'author@harbourlane.example')!

function ensembleOf(configurations: Configuration[], labels: Array<Record<string, string | number>>): PointEnsemble {
  return { d: configurations[0]!.d, configurations, labels, format: 'npy', warnings: [] }
}

async function signIn(who: { email: string, password: string } = author): Promise<string> {
  const response = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'origin': base },
    body: JSON.stringify({ email: who.email, password: who.password }),
  })
  if (!response.ok) throw new Error(`the demo account ${who.email} could not sign in (${response.status})`)
  return response.headers.getSetCookie()[0]!.split(';')[0]!
}

async function upload(cookie: string, setting: Record<string, unknown>, fileName: string, bytes: Uint8Array) {
  const form = new FormData()
  form.append('setting', JSON.stringify(setting))
  form.append('file', new Blob([bytes as Uint8Array<ArrayBuffer>]), fileName)
  const response = await fetch(`${base}/api/companions/${demoCompanion.slug}/ensembles`, { method: 'POST', headers: { origin: base, cookie }, body: form })
  if (response.status === 201) return 'stored'
  if (response.status === 409) return 'already there'
  throw new Error(`${fileName}: ${response.status} ${await response.text()}`)
}

const cookie = await signIn()

// β = 2 exact samples of the two-dimensional plasma with V = |x|² (Ginibre), N = 100 … 800.
const ginibre = [100, 200, 400, 800].flatMap(N => [1, 2].map((seed) => {
  const sample = sampleGinibre({ N }, createRng(`demo-ginibre-${N}-${seed}`))
  return { configuration: sample.configuration, labels: { N, beta: 2, seed: `demo-ginibre-${N}-${seed}` } }
}))

// Four seeds at N = 400 in one NPY array of shape (4, 400, 2).
const at400 = [1, 2, 3, 4].map(seed => sampleGinibre({ N: 400 }, createRng(`demo-ginibre-400-${seed}`)).configuration)
console.log(`Ginibre N = 400: ${await upload(cookie, {
  name: 'β = 2 exact samples (Ginibre), N = 400, four seeds',
  description: 'Eigenvalues of G/√N, G with independent standard complex Gaussian entries, made by the engine\'s sampler from the seeds demo-ginibre-400-1 … 4.',
  geometry: { kind: 'free', d: 2 }, kernel: { name: 'log' }, potential: 'r^2', beta: 2,
}, 'ginibre-n400.npy', writeNpy(ensembleOf(at400, at400.map((_, k) => ({ N: 400, seed: `demo-ginibre-400-${k + 1}` })))))}`)

// The same, every N in one file (configurations of different N: JSON keeps them apart).
const json = JSON.stringify({
  configurations: ginibre.map(g => ({
    points: Array.from({ length: g.configuration.N }, (_, i) => [g.configuration.points[2 * i], g.configuration.points[2 * i + 1]]),
    labels: g.labels,
  })),
})
console.log(`Ginibre, all N: ${await upload(cookie, {
  name: 'β = 2 exact samples, all N', geometry: { kind: 'free', d: 2 }, kernel: { name: 'log' }, potential: 'r^2', beta: 2,
}, 'ginibre-all-n.json', new TextEncoder().encode(json))}`)

// The one-dimensional log-gas at β = 1, 2, 4 (β-Hermite tridiagonal model), N = 200.
const hermite = [1, 2, 4].map((beta) => {
  const sample = sampleBetaHermite({ N: 200, beta }, createRng(`demo-hermite-${beta}`))
  return { configuration: sample.configuration, labels: { N: 200, beta, seed: `demo-hermite-${beta}` } }
})
console.log(`β-Hermite ensemble: ${await upload(cookie, {
  name: 'Log-gas on the line, β = 1, 2, 4, N = 200', geometry: { kind: 'free', d: 1 }, kernel: { name: 'log' }, potential: 'x^2', beta: null,
  labels: { note: 'β per configuration in the labels' },
}, 'hermite-n200.csv', new TextEncoder().encode(writeCsv(ensembleOf(hermite.map(h => h.configuration), hermite.map(h => h.labels)))))}`)

// Ground states (β = ∞) of the Coulomb energy on the sphere, N = 4 … 12, by L-BFGS with restarts.
const thomson = [4, 5, 6, 8, 12].map((N) => {
  const result = groundState({ N, kernel: { name: 'riesz', s: 1 }, geometry: { kind: 'sphere' }, restarts: 6 }, createRng(`demo-thomson-${N}`))
  return { configuration: result.best, labels: { N, energy: result.energy } }
})
const sphereJson = JSON.stringify({
  configurations: thomson.map(t => ({
    points: Array.from({ length: t.configuration.N }, (_, i) => [0, 1, 2].map(k => t.configuration.points[3 * i + k]!)),
    labels: t.labels,
  })),
})
console.log(`Sphere ground states: ${await upload(cookie, {
  name: 'Coulomb ground states on the sphere, N = 4 to 12', geometry: { kind: 'sphere' }, kernel: { name: 'riesz', s: 1 }, potential: null, beta: null,
}, 'thomson.json', new TextEncoder().encode(sphereJson))}`)

// A computation, a figure and the companion page, as the demo author would make them (once).
async function api<T>(method: string, path: string, body?: unknown): Promise<T> {
  const response = await fetch(`${base}/api/companions/${demoCompanion.slug}${path}`, {
    method,
    headers: { origin: base, cookie, ...(body === undefined ? {} : { 'content-type': 'application/json' }) },
    body: body === undefined ? undefined : JSON.stringify(body),
  })
  if (!response.ok) throw new Error(`${method} ${path}: ${response.status} ${await response.text()}`)
  return await response.json() as T
}

const { ensembles } = await api<{ ensembles: Array<{ id: number, name: string }> }>('GET', '/ensembles')
const four = ensembles.find(e => e.name.startsWith('β = 2 exact samples (Ginibre), N = 400'))
const allN = ensembles.find(e => e.name === 'β = 2 exact samples, all N')
const { computations } = await api<{ computations: Array<{ id: number, name: string }> }>('GET', '/computations')
async function computation(name: string, quantity: string, ensembleIds: number[], parameters: Record<string, number>) {
  const found = computations.find(c => c.name === name)
  if (found) return found.id
  return (await api<{ id: number }>('POST', '/computations', { name, quantity, ensembleIds, parameters })).id
}
if (four && allN) {
  const g = await computation('Pair correlation at β = 2, N = 400', 'statistic:pair-correlation', [four.id], { 'window-radius': 0.9, 'bins': 16, 'rmax': 0.25 })
  const energy = await computation('Energies at β = 2, every N', 'energy', [allN.id], {})
  const { figures } = await api<{ figures: Array<{ number: number }> }>('GET', '/figures')
  if (figures.length === 0) {
    await api('POST', '/figures', { title: 'Pair correlation of the β = 2 plasma', template: 'pair-correlation', computationIds: [g], caption: 'Four exact samples at N = 400, points within 0.9 of the centre, shell averages with their spread across configurations.' })
  }
  const page = await api<{ text: string }>('GET', '/page')
  if (!page.text) {
    await api('PUT', '/page', {
      message: 'First draft of the companion page',
      text: [
        '## What this companion holds',
        '',
        'The ensembles are exact samples of the two-dimensional one-component plasma at $\\beta = 2$ with $V(x) = |x|^2$,',
        'made by the engine\'s Ginibre sampler from fixed seeds, at $N = 100, 200, 400, 800$. Every number below is',
        'recomputed by the server from those files. The energy is, in the canonical convention,',
        '',
        '$$',
        'H_N = \\sum_{i \\ne j} -\\log|x_i - x_j| + N \\sum_{i=1}^{N} V(x_i).',
        '$$',
        '',
        '## Pair correlation',
        '',
        '@figure 1',
        '',
        '## Energies',
        '',
        `@table ${energy} columns=N,pairSum,confinement,H rows=8`,
        '',
      ].join('\n'),
    })
  }
  // The review under way: the authors submitted, the reviewer remarked on one shell of figure 1.
  const { companion } = await api<{ companion: { state: string } }>('GET', '')
  if (companion.state === 'draft') {
    await api('POST', '/state', { to: 'in_review', reason: 'Data, figure and page are ready for the referee.' })
  }
  const reviewer = demoAccounts.find(a => a.email === 'reviewer@harbourlane.example')!
  const reviewerCookie = await signIn(reviewer)
  const { remarks } = await api<{ remarks: unknown[] }>('GET', '/remarks', undefined, reviewerCookie)
  if (remarks.length === 0) {
    await api('POST', '/remarks', {
      figureNumber: 1,
      anchor: { kind: 'datum', x: 0.0234375, y: 0.25 },
      body: 'The innermost shells sit on the reference, but with four configurations the spread is large; could more seeds at N = 400 be added?',
    }, reviewerCookie)
  }
  console.log('Demo computations, figure, page and review: in place')
}
