// Interaction kernels g and their Coulomb constants c_d, with −Δg = c_d δ₀ where g is Coulomb:
//   log      g(x) = −log|x|        (d = 2: c_2 = 2π; in d = 1 it is not Coulomb)
//   coulomb  g(x) = |x|^(2−d)      (c_d = (d−2)|S^(d−1)|, so c_3 = 4π)
//   riesz    g(x) = |x|^(−s), s > 0
// Sources: Saff & Totik, Logarithmic Potentials with External Fields (1997), ch. 0;
// Landkof, Foundations of Modern Potential Theory (1972), ch. I.
import type { Kernel } from './types'

/** Surface area |S^(d−1)| of the unit sphere in R^d, for d = 1, 2, 3 (common practice). */
export function unitSphereArea(d: number): number {
  if (d === 1) return 2
  if (d === 2) return 2 * Math.PI
  if (d === 3) return 4 * Math.PI
  throw new RangeError(`unitSphereArea: dimension ${d} is not supported (1, 2 or 3)`)
}

/** c_d with −Δg = c_d δ₀, or undefined when the kernel is not Coulomb in dimension d. */
export function coulombConstant(kernel: Kernel, d: number): number | undefined {
  if (kernel.name === 'log') return d === 2 ? 2 * Math.PI : undefined
  if (kernel.name === 'coulomb') return d >= 3 ? (d - 2) * unitSphereArea(d) : undefined
  if (kernel.name === 'riesz' && d >= 3 && Math.abs(kernel.s - (d - 2)) < 1e-15) return (d - 2) * unitSphereArea(d)
  return undefined
}

/** Checks that a kernel makes sense in dimension d; throws a RangeError saying why not. */
export function assertKernel(kernel: Kernel, d: number): void {
  if (kernel.name === 'coulomb' && d < 3) throw new RangeError(`the coulomb kernel |x|^(2−d) needs d ≥ 3 (got d = ${d}); use the log kernel in d = 1, 2`)
  if (kernel.name === 'riesz' && !(kernel.s > 0 && Number.isFinite(kernel.s))) throw new RangeError(`the riesz exponent s must be a finite number > 0 (got ${kernel.s})`)
}

/** g as a function of the squared distance r² (avoids a square root; 0.5·log r² for log). */
export function kernelOfSquaredDistance(kernel: Kernel, d: number): (r2: number) => number {
  switch (kernel.name) {
    case 'log':
      return r2 => -0.5 * Math.log(r2)
    case 'coulomb': {
      const half = (2 - d) / 2
      return d === 3 ? r2 => 1 / Math.sqrt(r2) : r2 => Math.pow(r2, half)
    }
    case 'riesz': {
      const half = -kernel.s / 2
      return r2 => Math.pow(r2, half)
    }
  }
}

/** g(r) as a function of the distance r > 0. */
export function kernelOfDistance(kernel: Kernel, d: number): (r: number) => number {
  const f = kernelOfSquaredDistance(kernel, d)
  return r => f(r * r)
}

/** A short name for display, e.g. "−log|x|", "|x|^(−1)", "|x|^(−0.5)". */
export function kernelLabel(kernel: Kernel, d: number): string {
  if (kernel.name === 'log') return '−log|x|'
  if (kernel.name === 'coulomb') return `|x|^(${2 - d})`
  return `|x|^(−${kernel.s})`
}
