// Steps shared by `npm start` and `npm test`: dependencies, services, migrations.
import { existsSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { root } from './config.mjs'
import { log, runOrThrow } from './run.mjs'

/** Installs the npm dependencies when node_modules is missing or older than the lock file. */
export async function ensureDependencies() {
  const modules = join(root, 'node_modules', '.package-lock.json')
  const lock = join(root, 'package-lock.json')
  if (existsSync(modules) && existsSync(lock) && statSync(modules).mtimeMs >= statSync(lock).mtimeMs) return
  log('installing npm dependencies (first run takes a few minutes)')
  await runOrThrow('npm', existsSync(lock) ? ['ci', '--no-audit', '--no-fund'] : ['install', '--no-audit', '--no-fund'], { cwd: root })
}

export function npxBin(name) {
  return join(root, 'node_modules', '.bin', name)
}

/** Compiles the SIMD pair kernels when their generated module is missing or older than the source. */
export async function ensureWasm() {
  const generated = join(root, 'shared', 'physics', 'fast', 'pairs-wasm.ts')
  const source = join(root, 'native', 'pairs.ts')
  if (existsSync(generated) && statSync(generated).mtimeMs >= statSync(source).mtimeMs) return
  log('compiling the WebAssembly pair kernels (AssemblyScript)')
  await runOrThrow(process.execPath, [join(root, 'scripts', 'build-wasm.mjs')], { cwd: root })
}

/** Compiles the native direct log kernels when their addon is missing or older than its sources;
 *  `required` (npm test) makes a failed build an error, otherwise the engine keeps the WebAssembly path. */
export async function ensureNative({ required = false } = {}) {
  const addon = join(root, 'native', 'build', 'pairs.node')
  const sources = ['pairs-native.c', 'pairs-rows.h'].map(f => join(root, 'native', f))
  if (existsSync(addon) && sources.every(f => statSync(addon).mtimeMs >= statSync(f).mtimeMs)) return
  log('compiling the native direct log kernels (C compiler, Node-API)')
  await runOrThrow(process.execPath, [join(root, 'scripts', 'build-native.mjs'), ...(required ? ['--required'] : [])], { cwd: root })
}
