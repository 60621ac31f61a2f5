// Compiles the native direct log kernels (native/pairs-native.c, a Node-API addon) with the machine's
// C compiler into native/build/pairs.node. The engine uses them for direct log pair sums when the file
// loads, and the WebAssembly kernels otherwise; so a machine without a compiler or Node's headers only
// loses speed, and this script says why and exits 0 (exit 1 with --required, as `npm test` runs it).
// Usage: node scripts/build-native.mjs [--required]
import { spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, renameSync, rmSync } from 'node:fs'
import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'

const root = join(dirname(fileURLToPath(import.meta.url)), '..')
const required = process.argv.includes('--required')
const source = join(root, 'native/pairs-native.c')
const target = join(root, 'native/build/pairs.node')

function giveUp(why) {
  console.error(`build-native: ${why}; direct log sums will use the WebAssembly kernels`)
  process.exit(required ? 1 : 0)
}

/** Node's own C headers (node_api.h): npm's nodedir, then the prefix of this Node. */
function nodeHeaders() {
  const candidates = [
    process.env.npm_config_nodedir && join(process.env.npm_config_nodedir, 'include', 'node'),
    join(dirname(dirname(process.execPath)), 'include', 'node'),
    '/usr/include/node',
  ].filter(Boolean)
  return candidates.find(dir => existsSync(join(dir, 'node_api.h')))
}

const compiler = process.env.CC || 'cc'
if (spawnSync(compiler, ['--version'], { stdio: 'ignore' }).status !== 0) giveUp(`no C compiler (${compiler}) on this machine`)
const headers = nodeHeaders()
if (!headers) giveUp('Node\'s C headers (node_api.h) were not found')

mkdirSync(dirname(target), { recursive: true })
const partial = join(dirname(target), `pairs.${process.pid}.partial.node`)
const args = ['-O3', '-ffp-contract=off', '-fno-math-errno', '-fPIC', '-shared', '-Wall', '-Wextra', '-Werror', `-I${headers}`, '-o', partial, source, '-lm', '-lpthread']
const r = spawnSync(compiler, args, { stdio: ['ignore', 'inherit', 'inherit'] })
if (r.status !== 0) {
  rmSync(partial, { force: true })
  giveUp(`${compiler} failed (exit ${r.status})`)
}
try {
  const addon = createRequire(import.meta.url)(partial)
  const isa = addon.isa()
  renameSync(partial, target)
  console.log(`build-native: ${target} (${isa} kernels on this CPU)`)
}
catch (e) {
  rmSync(partial, { force: true })
  giveUp(`the compiled addon does not load: ${e instanceof Error ? e.message : String(e)}`)
}
