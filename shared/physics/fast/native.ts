// The native direct log kernels (native/pairs-native.c, compiled at install time by
// scripts/build-native.mjs): Σ_{i<j} log|x_i − x_j|² by products of squared distances on 512-bit or
// 256-bit vector lanes and several threads. They are found lazily, in Node only (this module has no
// static Node imports, so it bundles for the browser, where `nativeLogKernels()` is undefined):
//   QF_NATIVE_KERNELS=<path>   the addon to load;  QF_NATIVE_KERNELS=off   never load one
//   otherwise                  native/build/pairs.node under the working directory
// The row blocks and their order are those of the WebAssembly kernels (chunks.ts), so the value does
// not depend on the number of threads.
import { EngineInputError } from '../errors'
import { balancedRowBlocks, sumInOrder } from './chunks'

interface NativeAddon {
  logPairBlocks: (x: Float64Array, y: Float64Array, z: Float64Array | null, bounds: Int32Array, threads: number, isa?: string) => Float64Array
  isa: () => string
}

export interface NativeLogKernels {
  /** The vector width in use: 'avx512', 'avx2' or 'scalar'. */
  readonly isa: string
  /** Threads used by default (the machine's parallelism, at most 2). */
  readonly threads: number
  /** Where the addon was loaded from. */
  readonly path: string
  readonly addon: NativeAddon
}

interface NodeProcess {
  env: Record<string, string | undefined>
  cwd: () => string
  getBuiltinModule?: (name: string) => unknown
}

let loaded: NativeLogKernels | null | undefined

/** The native kernels, or undefined when none could be loaded (not built, not Node, or switched off). */
export function nativeLogKernels(): NativeLogKernels | undefined {
  if (loaded === undefined) loaded = load()
  return loaded ?? undefined
}

function load(): NativeLogKernels | null {
  const proc = (globalThis as { process?: NodeProcess }).process
  if (!proc?.getBuiltinModule) return null
  const setting = proc.env.QF_NATIVE_KERNELS
  if (setting === 'off') return null
  try {
    const { createRequire } = proc.getBuiltinModule('node:module') as typeof import('node:module')
    const { join } = proc.getBuiltinModule('node:path') as typeof import('node:path')
    const { existsSync } = proc.getBuiltinModule('node:fs') as typeof import('node:fs')
    const { availableParallelism } = proc.getBuiltinModule('node:os') as typeof import('node:os')
    const path = setting || join(proc.cwd(), 'native', 'build', 'pairs.node')
    if (!existsSync(path)) return null
    const addon = createRequire(join(proc.cwd(), 'package.json'))(path) as NativeAddon
    return { isa: addon.isa(), threads: Math.min(2, Math.max(1, availableParallelism())), path, addon }
  }
  catch {
    return null
  }
}

/** Σ_{i<j} log|x_i − x_j|² over the balanced row blocks, by the native kernels (d = 1, 2, 3 coordinates
 *  per point, flat). `isa` picks a narrower kernel than the CPU's widest (for tests). */
export function nativeLogSquaredSum(kernels: NativeLogKernels, points: Float64Array, d: number, threads = kernels.threads, isa?: string): number {
  const N = points.length / d
  if (N < 2) return 0
  const x = new Float64Array(N)
  const y = new Float64Array(N)
  const z = d === 3 ? new Float64Array(N) : null
  for (let i = 0; i < N; i++) {
    x[i] = points[i * d]
    if (d > 1) y[i] = points[i * d + 1]
    if (z) z[i] = points[i * d + 2]
  }
  const bounds = Int32Array.from(balancedRowBlocks(N))
  try {
    return sumInOrder(kernels.addon.logPairBlocks(x, y, z, bounds, threads, isa))
  }
  catch (e) {
    const c = e as { i?: number, j?: number }
    if (typeof c.i === 'number' && typeof c.j === 'number') {
      throw new EngineInputError(`points ${c.i} and ${c.j} coincide; the interaction energy is infinite`, { indices: [c.i, c.j] })
    }
    throw e
  }
}
