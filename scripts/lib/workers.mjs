// Bundles the worker-thread entry points (server/workers/*.ts) into standalone ES modules.
import { readdirSync } from 'node:fs'
import { join } from 'node:path'
import { build } from 'esbuild'
import { root } from './config.mjs'

export async function buildWorkers(outdir) {
  const dir = join(root, 'server', 'workers')
  const entryPoints = readdirSync(dir).filter(f => f.endsWith('.ts')).map(f => join(dir, f))
  if (entryPoints.length === 0) return
  await build({
    entryPoints,
    outdir,
    outExtension: { '.js': '.mjs' },
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'esm',
    sourcemap: false,
    logLevel: 'warning',
    banner: { js: 'import { createRequire as __qfRequire } from \'node:module\'; const require = __qfRequire(import.meta.url);' },
  })
}
