// Loader for the SIMD pair kernels compiled from native/pairs.ts (bytes in pairs-wasm.ts) and the
// direct pair sums, potentials and forces computed with them. The kernels sum blocks of rows of
// Σ_{i<j} g(x_i − x_j) with compensation (Neumaier 1974; Higham 2002, §4.3); the log kernel uses
// products of squared distances, one logarithm per product leaving [1e−150, 1e150].
import type { Geometry, Kernel } from '../types'
import { EngineInputError } from '../errors'
import { PAIRS_WASM_BASE64 } from './pairs-wasm'
import type { PairPlan } from './plan'
import { planPairSum } from './plan'
import { balancedRowBlocks, sumInOrder } from './chunks'

interface PairExports {
  memory: WebAssembly.Memory
  heapBase: () => number
  coincidentI: () => number
  coincidentJ: () => number
  energyLog2: (px: number, py: number, pz: number, n: number, i0: number, i1: number) => number
  energyLog3: (px: number, py: number, pz: number, n: number, i0: number, i1: number) => number
  energyPower: (px: number, py: number, pz: number, n: number, i0: number, i1: number, mode: number, s: number) => number
  fieldLog2: (px: number, py: number, n: number, i0: number, i1: number, phi: number, fx: number, fy: number) => number
  blockLog2: (px: number, py: number, pz: number, a0: number, a1: number, b0: number, b1: number) => number
  blockCoulomb3: (px: number, py: number, pz: number, a0: number, a1: number, b0: number, b1: number) => number
  fieldCoulomb3: (px: number, py: number, pz: number, n: number, i0: number, i1: number, phi: number, fx: number, fy: number, fz: number) => number
}

/** True when this runtime has WebAssembly with 128-bit SIMD. */
export function wasmSimdAvailable(): boolean {
  try {
    return typeof WebAssembly === 'object' && WebAssembly.validate(pairKernelBytes())
  }
  catch {
    return false
  }
}

/** The module's bytes, decoded from base64. */
export function pairKernelBytes(): Uint8Array<ArrayBuffer> {
  const text = atob(PAIRS_WASM_BASE64)
  const bytes = new Uint8Array(text.length)
  for (let k = 0; k < text.length; k++) bytes[k] = text.charCodeAt(k)
  return bytes
}

/** Compiles the module (synchronously; fine in Node and in workers). */
export function compilePairKernels(): WebAssembly.Module {
  return new WebAssembly.Module(pairKernelBytes())
}

/** One instance of the kernels with its own memory, holding one configuration at a time. */
export class PairKernels {
  private readonly x: PairExports
  private n = 0
  private px = 0
  private py = 0
  private pz = 0
  private out = 0

  constructor(module: WebAssembly.Module = compilePairKernels()) {
    const abort = (): never => {
      throw new Error('pair kernels aborted')
    }
    const instance = new WebAssembly.Instance(module, { env: { abort } })
    this.x = instance.exports as unknown as PairExports
  }

  /** Copies N points of dimension d (1, 2 or 3) into the module, one array per axis. */
  load(points: Float64Array, d: number): void {
    const n = points.length / d
    const base = Math.ceil(this.x.heapBase() / 64) * 64
    const need = base + 8 * n * 7 + 256
    const mem = this.x.memory
    if (mem.buffer.byteLength < need) mem.grow(Math.ceil((need - mem.buffer.byteLength) / 65536))
    this.n = n
    this.px = base
    this.py = base + 8 * n
    this.pz = base + 16 * n
    this.out = base + 24 * n
    const f = new Float64Array(mem.buffer, base, 3 * n)
    f.fill(0)
    for (let i = 0; i < n; i++) {
      for (let k = 0; k < d; k++) f[k * n + i] = points[i * d + k]
    }
  }

  private check(v: number): number {
    if (Number.isNaN(v)) {
      const i = this.x.coincidentI()
      const j = this.x.coincidentJ()
      if (i >= 0) throw new EngineInputError(`points ${i} and ${j} coincide; the interaction energy is infinite`, { indices: [i, j] })
    }
    return v
  }

  /** Σ_{i0 ≤ i < i1} Σ_{j > i} g(x_i − x_j) for the loaded points. */
  rows(plan: PairPlan, i0: number, i1: number): number {
    const { px, py, pz, n } = this
    if (plan.kind === 'log') {
      const raw = plan.d === 3 ? this.x.energyLog3(px, py, pz, n, i0, i1) : this.x.energyLog2(px, py, pz, n, i0, i1)
      return -0.5 * this.check(raw)
    }
    return this.check(this.x.energyPower(px, py, pz, n, i0, i1, plan.mode, plan.s))
  }

  /** Σ log|x_i − x_j|² over i in [a0, a1), j in [b0, b1) (j > i when the ranges are equal) for
   *  loaded points in the plane with coordinates below 1e34; NaN when two points coincide (see
   *  `coincidence`). */
  blockLog2(a0: number, a1: number, b0: number, b1: number): number {
    return this.x.blockLog2(this.px, this.py, this.pz, a0, a1, b0, b1)
  }

  /** Σ 1/|x_i − x_j| over i in [a0, a1), j in [b0, b1) (j > i when the ranges are equal) for loaded
   *  points in space; NaN when two points coincide (see `coincidence`). */
  blockCoulomb3(a0: number, a1: number, b0: number, b1: number): number {
    return this.x.blockCoulomb3(this.px, this.py, this.pz, a0, a1, b0, b1)
  }

  /** The coincident pair found by the last call, if any (indices of the loaded points). */
  coincidence(): [number, number] | undefined {
    const i = this.x.coincidentI()
    return i >= 0 ? [i, this.x.coincidentJ()] : undefined
  }

  /** Potentials and forces at rows [i0, i1): log in the plane (d = 2) or 1/r in space (d = 3). */
  fields(d: 2 | 3, i0: number, i1: number): { potential: Float64Array, force: Float64Array } {
    const { px, py, pz, n, out } = this
    const o = [out, out + 8 * n, out + 16 * n, out + 24 * n]
    if (d === 2) this.check(this.x.fieldLog2(px, py, n, i0, i1, o[0], o[1], o[2]))
    else this.check(this.x.fieldCoulomb3(px, py, pz, n, i0, i1, o[0], o[1], o[2], o[3]))
    const buf = this.x.memory.buffer
    const potential = new Float64Array(buf, o[0], n).slice(i0, i1)
    const force = new Float64Array((i1 - i0) * d)
    for (let k = 0; k < d; k++) {
      const axis = new Float64Array(buf, o[k + 1], n)
      for (let i = i0; i < i1; i++) force[(i - i0) * d + k] = axis[i]
    }
    return { potential, force }
  }
}

/** Σ_{i<j} g(x_i − x_j) with the SIMD kernels on this thread, summed over the same balanced row
 *  blocks, in the same order, as the worker pool (so the two agree to the bit). */
export function wasmPairSum(points: Float64Array, d: number, kernel: Kernel, geometry: Geometry, kernels: PairKernels = new PairKernels()): number {
  const plan = planPairSum(points, d, kernel, geometry)
  const N = points.length / d
  if (N < 2) return 0
  kernels.load(points, d)
  const bounds = balancedRowBlocks(N)
  const parts: number[] = []
  for (let k = 0; k + 1 < bounds.length; k++) parts.push(kernels.rows(plan, bounds[k], bounds[k + 1]))
  return sumInOrder(parts)
}

/** Potentials φ_i = Σ_{j≠i} g(x_i − x_j) and forces −∇_{x_i} Σ_{j≠i} g, for −log|x| (d = 2) or 1/|x| (d = 3). */
export function wasmFields(points: Float64Array, d: 2 | 3, kernels: PairKernels = new PairKernels()): { potential: Float64Array, force: Float64Array } {
  planPairSum(points, d, d === 2 ? { name: 'log' } : { name: 'coulomb' }, { kind: 'free', d })
  const N = points.length / d
  kernels.load(points, d)
  return kernels.fields(d, 0, N)
}
