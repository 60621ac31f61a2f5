// npm test: sets everything up (packages, MariaDB, the test database, a browser), then runs
// lint, typecheck, the unit and reference tests, builds the app, serves it against the test
// database, runs the API tests and the browser tests, and ends with "N passed, N failed".
import { spawn } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs'
import { join } from 'node:path'
import { app, databaseUrl, dataDir, db, objectStore, root, serviceEnvironment } from './lib/config.mjs'
import { emptyBucket } from './lib/objectstore.mjs'
import { recreateDatabase } from './lib/mariadb.mjs'
import { startServices, stopServices } from './lib/services.mjs'
import { ensureDebianPackages, log, run, sleep, waitForHealth, which } from './lib/run.mjs'
import { ensureDependencies, ensureNative, ensureWasm, npxBin } from './lib/setup.mjs'

const artifacts = join(root, 'tests', '.artifacts')
// For iterating (never in CI): QF_TEST_FILTER=remarks runs only the test files whose path contains
// one of the given words (space-separated); QF_TEST_SKIP=lint,typecheck,unit skips those steps.
const filters = (process.env.QF_TEST_FILTER ?? '').split(/\s+/).filter(Boolean)
const skipped = new Set((process.env.QF_TEST_SKIP ?? '').split(',').map(s => s.trim()).filter(Boolean))
const results = []
let passed = 0
let failed = 0

function record(name, ok, detail = '') {
  results.push({ name, ok, detail })
  if (ok) passed++
  else failed++
}

/** Runs one vitest project and adds its test counts (a run that never reports counts as one failure). */
async function vitestProject(project, env) {
  const out = join(artifacts, `vitest-${project}.json`)
  rmSync(out, { force: true })
  const extra = filters.length ? ['--passWithNoTests', ...filters] : []
  const code = await run(npxBin('vitest'), ['run', '--project', project, '--reporter=default', '--reporter=json', `--outputFile.json=${out}`, ...extra], { cwd: root, env })
  if (!existsSync(out)) {
    record(`vitest ${project}`, false, `no report (exit ${code})`)
    return
  }
  const report = JSON.parse(readFileSync(out, 'utf8'))
  passed += report.numPassedTests
  failed += report.numFailedTests
  const suiteFailures = report.testResults.filter(r => r.status === 'failed' && r.assertionResults.length === 0).length
  failed += suiteFailures
  results.push({ name: `vitest ${project}`, ok: code === 0, detail: `${report.numPassedTests} passed, ${report.numFailedTests + suiteFailures} failed` })
  if (code !== 0 && report.numFailedTests + suiteFailures === 0) record(`vitest ${project} exit code`, false, `exit ${code}`)
}

async function step(name, command, args, env) {
  if (skipped.has(name)) {
    log(`— ${name}: skipped (QF_TEST_SKIP)`)
    return true
  }
  log(`— ${name}`)
  const code = await run(command, args, { cwd: root, env })
  record(name, code === 0, code === 0 ? '' : `exit ${code}`)
  return code === 0
}

async function main() {
  mkdirSync(artifacts, { recursive: true })
  await ensureDependencies()
  await ensureWasm()
  if (!which(process.env.CC || 'cc')) await ensureDebianPackages(['gcc', 'libc6-dev'], 'The native direct log kernels (a C compiler)')
  await ensureNative({ required: true })
  if (!existsSync('/usr/bin/chromium') && !which('chromium')) await ensureDebianPackages(['chromium'], 'The browser tests (Chromium)')
  const started = await startServices()
  let server
  try {
    recreateDatabase(db.testName)
    rmSync(join(dataDir, 'app-test'), { recursive: true, force: true })
    if (objectStore.local) await emptyBucket(objectStore.testBucket)
    const testDatabaseUrl = databaseUrl(db.testName)
    const { applyMigrations } = await import('./migrate.mjs')
    await applyMigrations(testDatabaseUrl)

    const baseUrl = `http://127.0.0.1:${app.testPort}`
    const env = {
      ...process.env,
      NUXT_TELEMETRY_DISABLED: '1',
      ...serviceEnvironment({ test: true }),
      NUXT_DATABASE_URL: testDatabaseUrl,
      NUXT_DEPLOYMENT: 'test',
      NUXT_TRUST_PROXY: 'true',
      // The test server only answers requests; tests that need computations start a runner (tests/support/runner.ts).
      NUXT_RUN_JOBS: 'false',
      QF_BASE_URL: baseUrl,
      QF_CHROMIUM: existsSync('/usr/bin/chromium') ? '/usr/bin/chromium' : which('chromium') ?? '',
    }

    await step('prepare', npxBin('nuxt'), ['prepare'], env)
    await step('lint', npxBin('eslint'), ['.'], env)
    await step('typecheck', npxBin('nuxt'), ['typecheck'], env)
    log('— unit and reference tests')
    if (!skipped.has('unit')) await vitestProject('unit', env)

    const built = await step('build', npxBin('nuxt'), ['build'], env)
    if (!built) {
      record('api tests', false, 'not run: the build failed')
      record('browser tests', false, 'not run: the build failed')
      return
    }
    server = spawn(process.execPath, [join(root, '.output', 'server', 'index.mjs')], {
      cwd: root,
      env: { ...env, HOST: '127.0.0.1', PORT: String(app.testPort), NITRO_HOST: '127.0.0.1', NITRO_PORT: String(app.testPort) },
      stdio: ['ignore', 'pipe', 'pipe'],
    })
    let serverLog = ''
    const keep = (chunk) => {
      serverLog += chunk
    }
    server.stdout.on('data', keep)
    server.stderr.on('data', keep)
    if (!(await waitForHealth(baseUrl, server))) {
      record('test server', false, `did not become healthy:\n${serverLog.slice(-4000)}`)
      return
    }
    log('— API tests against the real database')
    await vitestProject('api', env)
    log('— browser tests (playwright-core + Debian chromium)')
    await vitestProject('e2e', env)
    if (failed > 0) process.stdout.write(`\n[quillfield] last lines of the test server's log:\n${serverLog.slice(-3000)}\n`)
  }
  finally {
    if (server && server.exitCode === null) {
      server.kill('SIGTERM')
      for (let i = 0; i < 50 && server.exitCode === null; i++) await sleep(100)
    }
    if (started.length) await stopServices(started)
  }
}

try {
  await main()
}
catch (error) {
  record('setup', false, error instanceof Error ? error.message : String(error))
}
process.stdout.write('\nSummary\n')
for (const r of results) process.stdout.write(`  ${r.ok ? 'ok  ' : 'FAIL'} ${r.name}${r.detail ? ` — ${r.detail}` : ''}\n`)
process.stdout.write(`${passed} passed, ${failed} failed\n`)
process.exit(failed > 0 ? 1 : 0)
