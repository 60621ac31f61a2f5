// npm start: dependencies, services, migrations, demo seed, build, then serve on 127.0.0.1.
import { spawn } from 'node:child_process'
import { join } from 'node:path'
import { app, databaseUrl, root, serviceEnvironment } from './lib/config.mjs'
import { startServices } from './lib/services.mjs'
import { log, runOrThrow, waitForHealth } from './lib/run.mjs'
import { ensureDependencies, ensureNative, ensureWasm, npxBin } from './lib/setup.mjs'

async function main() {
  await ensureDependencies()
  await ensureWasm()
  await ensureNative()
  await startServices()
  const url = databaseUrl()
  const env = { ...process.env, ...serviceEnvironment(), NUXT_DEPLOYMENT: process.env.NUXT_DEPLOYMENT ?? 'demo', NUXT_TELEMETRY_DISABLED: '1' }
  const { applyMigrations } = await import('./migrate.mjs')
  await applyMigrations(url)
  const demo = env.NUXT_DEPLOYMENT !== 'production'
  if (demo) await runOrThrow(npxBin('tsx'), [join(root, 'scripts', 'seed.ts')], { cwd: root, env })
  if (process.env.QF_SKIP_BUILD !== '1') {
    log('building the application')
    await runOrThrow(npxBin('nuxt'), ['build'], { cwd: root, env })
  }
  const server = spawn(process.execPath, [join(root, '.output', 'server', 'index.mjs')], {
    cwd: root,
    stdio: 'inherit',
    env: { ...env, HOST: app.host, PORT: String(app.port), NITRO_HOST: app.host, NITRO_PORT: String(app.port) },
  })
  const address = `http://${app.host}:${app.port}`
  try {
    if (!(await waitForHealth(address, server))) throw new Error(`the application did not become healthy on ${address}`)
    if (demo) {
      log('adding the demo ensembles (made by the engine\'s samplers from fixed seeds)')
      await runOrThrow(npxBin('tsx'), [join(root, 'scripts', 'seed-ensembles.ts'), address], { cwd: root, env })
    }
  }
  catch (error) {
    server.kill('SIGTERM')
    throw error
  }
  const { demoAccounts } = demo ? await import('./demo-data.mjs') : { demoAccounts: [] }
  const lines = [
    '',
    `Quillfield is serving on ${address}`,
    ...(demo
      ? ['', 'Demo accounts (demo seed only; never in production):', ...demoAccounts.map(a => `  ${a.email.padEnd(32)} ${a.password.padEnd(22)} ${a.part}`)]
      : []),
    ...(demo && env.NUXT_MAIL_INBOX_URL ? ['', `Mail the application sends (invitations, notices, password links) is at ${address}/dev/inbox`] : []),
    '',
    'Ctrl-C stops the application; `npm run services:stop` stops MariaDB, the object store and the SMTP fake.',
    '',
  ]
  process.stdout.write(lines.join('\n'))
  const stop = () => server.kill('SIGTERM')
  process.on('SIGINT', stop)
  process.on('SIGTERM', stop)
  server.on('exit', code => process.exit(code ?? 0))
}

main().catch((error) => {
  console.error(`[quillfield] ${error instanceof Error ? error.message : error}`)
  process.exit(1)
})
