// The server stays interactive while a large recomputation runs: GET latency (p50, p99) of a
// companion page's data route with nothing running, then while a computation of the energy of
// N = 300 000 points runs in a worker thread, asked at tolerance 1e−14 so that the engine takes the
// direct sum (4.5·10¹⁰ pairs, the native kernels on both cores when built); printed as ratios measured
// in this run.
// Part of `npm run bench`; builds the app when there is no build (.output). Uses its own database.
import { spawn } from 'node:child_process'
import { existsSync } from 'node:fs'
import { join } from 'node:path'
import { databaseUrl, root, serviceEnvironment } from '../scripts/lib/config.mjs'
import { ensureDatabases, recreateDatabase } from '../scripts/lib/mariadb.mjs'
import { startServices, stopServices } from '../scripts/lib/services.mjs'
import { runOrThrow, sleep, waitForHealth } from '../scripts/lib/run.mjs'
import { npxBin } from '../scripts/lib/setup.mjs'

const port = 3150
const base = `http://127.0.0.1:${port}`
const name = 'quillfield_bench'

function quantile(sorted, q) {
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))]
}

async function latencies(url, headers, count) {
  const out = []
  for (let i = 0; i < count; i++) {
    const t = performance.now()
    const response = await fetch(url, { headers })
    await response.arrayBuffer()
    out.push(performance.now() - t)
  }
  return out.sort((a, b) => a - b)
}

const started = await startServices()
let server
try {
  if (!existsSync(join(root, '.output', 'server', 'index.mjs'))) await runOrThrow(npxBin('nuxt'), ['build'], { cwd: root })
  recreateDatabase(name)
  ensureDatabases([name])
  const url = databaseUrl(name)
  const { applyMigrations } = await import('../scripts/migrate.mjs')
  await applyMigrations(url)
  const env = { ...process.env, ...serviceEnvironment({ test: true }), NUXT_DATABASE_URL: url, NUXT_DEPLOYMENT: 'test', HOST: '127.0.0.1', PORT: String(port), NITRO_HOST: '127.0.0.1', NITRO_PORT: String(port), NUXT_DATA_PATH: join(root, '.data', 'app-bench') }
  server = spawn(process.execPath, [join(root, '.output', 'server', 'index.mjs')], { cwd: root, env, stdio: 'ignore' })
  if (!(await waitForHealth(base, server))) throw new Error('the bench server did not start')
  const signUp = await fetch(`${base}/api/auth/sign-up`, { method: 'POST', headers: { 'content-type': 'application/json', 'origin': base }, body: JSON.stringify({ email: `bench${Date.now()}@bench.example`, password: 'a long enough password', displayName: 'Bench' }) })
  const cookie = signUp.headers.getSetCookie()[0].split(';')[0]
  const headers = { cookie, origin: base }
  const slug = `bench-${Date.now().toString(36)}`
  await fetch(`${base}/api/companions`, { method: 'POST', headers: { ...headers, 'content-type': 'application/json' }, body: JSON.stringify({ title: 'Latency bench', slug }) })
  const N = 300_000
  const rows = ['x,y']
  for (let i = 0; i < N; i++) {
    const r = Math.sqrt((i + 0.5) / N)
    rows.push(`${r * Math.cos(i * 2.399963229728653)},${r * Math.sin(i * 2.399963229728653)}`)
  }
  const form = new FormData()
  form.append('setting', JSON.stringify({ name: 'spiral', geometry: { kind: 'free', d: 2 }, kernel: { name: 'log' }, potential: 'r^2' }))
  form.append('file', new Blob([`${rows.join('\n')}\n`]), 'spiral.csv')
  const up = await (await fetch(`${base}/api/companions/${slug}/ensembles`, { method: 'POST', headers, body: form })).json()
  const target = `${base}/api/companions/${slug}`
  await latencies(target, headers, 20)
  const idle = await latencies(target, headers, 300)
  const made = await (await fetch(`${base}/api/companions/${slug}/computations`, { method: 'POST', headers: { ...headers, 'content-type': 'application/json' }, body: JSON.stringify({ name: 'big energy', quantity: 'energy', ensembleIds: [up.id], parameters: { tolerance: 1e-14 } }) })).json()
  let status = 'queued'
  for (let i = 0; i < 100 && status !== 'running'; i++) {
    status = (await (await fetch(`${base}/api/companions/${slug}/computations/${made.id}`, { headers })).json()).computation.status
    await sleep(50)
  }
  const busy = await latencies(target, headers, 300)
  status = (await (await fetch(`${base}/api/companions/${slug}/computations/${made.id}`, { headers })).json()).computation.status
  console.log(`\n7. GET latency while a recomputation runs (direct energy of N = ${N}, in a worker thread; still ${status} at the end of the measurement)`)
  console.log(`  idle:  p50 ${quantile(idle, 0.5).toFixed(1)} ms, p99 ${quantile(idle, 0.99).toFixed(1)} ms`)
  console.log(`  busy:  p50 ${quantile(busy, 0.5).toFixed(1)} ms, p99 ${quantile(busy, 0.99).toFixed(1)} ms`)
  console.log(`  ratio busy/idle: p50 ${(quantile(busy, 0.5) / quantile(idle, 0.5)).toFixed(2)}×, p99 ${(quantile(busy, 0.99) / quantile(idle, 0.99)).toFixed(2)}× (target: busy p99 < 50 ms)`)
}
finally {
  if (server && server.exitCode === null) {
    server.kill('SIGTERM')
    for (let i = 0; i < 50 && server.exitCode === null; i++) await sleep(100)
  }
  await stopServices(started)
}
