// npm run dev: services and migrations, then the Nuxt dev server on 127.0.0.1.
import { join } from 'node:path'
import { app, databaseUrl, dataDir, root, serviceEnvironment } from './lib/config.mjs'
import { buildWorkers } from './lib/workers.mjs'
import { startServices } from './lib/services.mjs'
import { run } from './lib/run.mjs'
import { ensureDependencies, ensureNative, ensureWasm, npxBin } from './lib/setup.mjs'

await ensureDependencies()
await ensureWasm()
await ensureNative()
await startServices()
const { applyMigrations } = await import('./migrate.mjs')
await applyMigrations(databaseUrl())
// The dev server has no bundled output; the worker entry points are bundled here instead.
const workersDir = join(dataDir, 'dev-workers')
await buildWorkers(workersDir)
const code = await run(npxBin('nuxt'), ['dev', '--host', app.host, '--port', String(app.port)], {
  cwd: root,
  env: { ...process.env, ...serviceEnvironment(), NUXT_WORKERS_DIR: workersDir, NUXT_TELEMETRY_DISABLED: '1' },
})
process.exit(code)
