// Choice between the direct pair sum and a fast method for Σ_{i<j} g(x_i − x_j), from N, the kernel,
// the geometry and the requested relative tolerance. Deterministic: the same input always takes the
// same route. Direct sums (native vector kernels for the log kernel when they are built, SIMD kernels
// when WebAssembly is available, else plain TypeScript) have no truncation error, only rounding
// (compensated, ≈ 1e−15 relative); the fast methods carry the truncation bounds of fmm2d.ts (Greengard & Rokhlin, J. Comput. Phys. 73, 1987) and treecode.ts.
import type { Geometry, Kernel } from '../types'
import { pairSum } from '../energy'
import { EngineInputError } from '../errors'
import { ENGINE_VERSION } from '../version'
import { fmm2dEnergy } from './fmm2d'
import { fmm3dEnergy } from './fmm3d'
import { planPairSum } from './plan'
import { logPairTail, rieszTail, treecodeEnergy } from './treecode'
import { nativeLogKernels, nativeLogSquaredSum } from './native'
import { wasmPairSum, wasmSimdAvailable } from './wasm'

export type FastMethod = 'direct-native' | 'direct-wasm' | 'direct-ts' | 'fmm2d' | 'fmm3d' | 'treecode'

export interface FastEnergyOptions {
  /** Requested relative error (default 1e−10). */
  readonly tolerance?: number
  /** Force a method instead of choosing. */
  readonly method?: FastMethod
}

export interface FastEnergyResult {
  /** Σ_{i<j} g(x_i − x_j). */
  readonly value: number
  readonly method: FastMethod
  /** Bound of the relative truncation error (0 for direct sums). */
  readonly errorBound: number
  readonly parameters: Readonly<Record<string, number | string>>
  readonly engineVersion: string
}

/** Smallest N for which the 2-D log FMM replaces the direct sum (the FMM costs roughly 2.5 µs per
 *  point at 1e−10 against N/2 ns per point for the SIMD direct sum). */
export const FMM2D_MIN_N = 20000
/** The same against the native direct kernels (native.ts, two threads). Measured 2026-12-03 on this
 *  2-core machine (AVX-512), uniform points in the unit square, seconds direct / FMM at 1e−10 (1e−6):
 *  N = 2e4 0.031 / 0.047 (0.023), 5e4 0.107 / 0.102 (0.056), 1e5 0.42 / 0.17 (0.12), 2e5 1.55 / 0.36. */
export const FMM2D_MIN_N_NATIVE = 50000
/** Smallest N for which the 3-D Coulomb FMM energy (fmm3d.ts, an order per far pair of cells)
 *  replaces the single-thread SIMD direct sum in free space, by tolerance (Infinity: never). Measured
 *  2026-12-02 on this 2-core machine, uniform points in the unit cube, seconds direct / FMM:
 *    N = 3e4:  0.99 / 1.36 (1e−3), 1.72 (1e−4), 1.92 (1e−6), 1.60 (1e−8)
 *    N = 5e4:  2.58 / 2.15 (1e−3), 3.01 (1e−4), 4.56 (1e−6), 3.98 (1e−8)
 *    N = 1e5: 10.0  / 4.95 (1e−3), 6.56 (1e−4), 10.6 (1e−6), 14.6 (1e−8); 13.0 at 1e−10
 *  The direct sum grows as N², the FMM here about as N^1.3; the thresholds sit at or above the
 *  measured crossovers. */
export function fmm3dMinN(tolerance: number): number {
  if (tolerance >= 1e-3) return 50000
  if (tolerance >= 1e-4) return 70000
  if (tolerance >= 1e-6) return 150000
  if (tolerance >= 1e-10) return 300000
  return Infinity
}
/** Cost model of the tree code against the single-thread SIMD direct sum (measured in bench/run.ts):
 *  about 100 accepted nodes per point at θ = 0.5, each ~15 C(p + 3, 3) flops at ~1e9 flops/s, against
 *  N/2 pairs per point at ~1e9 pairs/s. The tree code wins only when N > 3000 C(p + 3, 3). */
export function treecodeWins(N: number, kernel: Kernel, d: number, tolerance: number): boolean {
  const s = kernel.name === 'log' ? 0 : kernel.name === 'coulomb' ? d - 2 : kernel.s
  let p = 30
  for (let k = 0; k <= 30; k++) {
    const bound = kernel.name === 'log' ? logPairTail(0.5, k) : rieszTail(0.5, k, s)
    if (bound <= tolerance) {
      p = k
      break
    }
  }
  const terms = ((p + 1) * (p + 2) * (p + 3)) / 6
  return N > 3000 * terms
}

/** Which method `fastEnergy` takes for these inputs. */
export function chooseMethod(N: number, d: number, kernel: Kernel, geometry: Geometry, tolerance: number, wasm = wasmSimdAvailable(), native = nativeLogKernels() !== undefined): FastMethod {
  const direct: FastMethod = native && kernel.name === 'log' ? 'direct-native' : wasm ? 'direct-wasm' : 'direct-ts'
  const planar = geometry.kind === 'free' && (d === 1 || d === 2)
  if (kernel.name === 'log' && planar && N >= (direct === 'direct-native' ? FMM2D_MIN_N_NATIVE : FMM2D_MIN_N) && tolerance >= 1e-13) return 'fmm2d'
  if (kernel.name === 'coulomb' && d === 3 && geometry.kind === 'free' && N >= fmm3dMinN(tolerance)) return 'fmm3d'
  if ((d === 3 || geometry.kind === 'sphere') && treecodeWins(N, kernel, 3, tolerance)) return 'treecode'
  return direct
}

/** Σ_{i<j} g(x_i − x_j) by the chosen (or the requested) method, with its error bound. */
export function fastEnergy(points: Float64Array, d: number, kernel: Kernel, geometry: Geometry, options: FastEnergyOptions = {}): FastEnergyResult {
  const plan = planPairSum(points, d, kernel, geometry)
  const tol = options.tolerance ?? 1e-10
  if (!(tol > 0 && tol < 1)) throw new EngineInputError(`the tolerance must be in (0, 1) (got ${tol})`)
  const N = points.length / d
  const method = options.method ?? chooseMethod(N, d, kernel, geometry, tol)
  if (method === 'fmm2d') {
    if (plan.kind !== 'log' || geometry.kind !== 'free' || d > 2) throw new EngineInputError('the 2-D FMM sums the log kernel of points on the line or in the plane only')
    const xy = d === 2 ? points : embedLine(points)
    const r = fmm2dEnergy(xy, { tolerance: tol })
    return { value: r.value, method, errorBound: r.errorBound, parameters: { ...r.parameters }, engineVersion: ENGINE_VERSION }
  }
  if (method === 'fmm3d') {
    if (kernel.name !== 'coulomb' || geometry.kind !== 'free' || d !== 3) throw new EngineInputError('the 3-D FMM sums the Coulomb kernel 1/|x| of points in R³ (free space) only')
    const r = fmm3dEnergy(points, { tolerance: tol })
    return { value: r.value, method, errorBound: r.errorBound, parameters: { ...r.parameters }, engineVersion: ENGINE_VERSION }
  }
  if (method === 'treecode') {
    const r = treecodeEnergy(points, d, kernel, geometry, { tolerance: tol })
    return { value: r.value, method, errorBound: r.errorBound, parameters: { ...r.parameters }, engineVersion: ENGINE_VERSION }
  }
  if (method === 'direct-native') {
    const kernels = nativeLogKernels()
    if (!kernels) throw new EngineInputError('the native direct kernels are not built on this machine (npm run build:native)')
    if (plan.kind !== 'log') throw new EngineInputError('the native direct kernels sum the log kernel only')
    const value = -0.5 * nativeLogSquaredSum(kernels, points, plan.d)
    return { value, method, errorBound: 0, parameters: { N, isa: kernels.isa, threads: kernels.threads }, engineVersion: ENGINE_VERSION }
  }
  if (method === 'direct-wasm') {
    return { value: wasmPairSum(points, d, kernel, geometry), method, errorBound: 0, parameters: { N }, engineVersion: ENGINE_VERSION }
  }
  return { value: N < 2 ? 0 : pairSum({ N, d, points }, kernel, geometry), method, errorBound: 0, parameters: { N }, engineVersion: ENGINE_VERSION }
}

/** Points on the line as points (x, 0) in the plane. */
function embedLine(points: Float64Array): Float64Array {
  const out = new Float64Array(2 * points.length)
  for (let i = 0; i < points.length; i++) out[2 * i] = points[i]
  return out
}
