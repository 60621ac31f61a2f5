// npm run dev: services and migrations, then the Nuxt dev server on 127.0.0.1.
import { app, databaseUrl, root } from './lib/config.mjs'
import { startServices } from './lib/services.mjs'
import { run } from './lib/run.mjs'
import { ensureDependencies, npxBin } from './lib/setup.mjs'

await ensureDependencies()
await startServices()
const { applyMigrations } = await import('./migrate.mjs')
await applyMigrations(databaseUrl())
const code = await run(npxBin('nuxt'), ['dev', '--host', app.host, '--port', String(app.port)], {
  cwd: root,
  env: { ...process.env, NUXT_DATABASE_URL: databaseUrl(), NUXT_TELEMETRY_DISABLED: '1' },
})
process.exit(code)
