// Energies of N points on the unit sphere S² ⊂ R³ (chordal distances):
//   Riesz s-energy  E_s = Σ_{i<j} |x_i − x_j|^(−s)   (s = 1: the Thomson problem),
//   log energy      E_log = Σ_{i<j} log(1/|x_i − x_j|),
// and the configurations known to minimise them for N = 2 … 6: antipodal pair, equilateral triangle on
// a great circle, regular tetrahedron, triangular bipyramid, regular octahedron (Föppl 1912;
// Schwartz, "The 5 electron case of Thomson's problem", Exp. Math. 22 (2013); Dragnev, Legg &
// Townsend, "Discrete logarithmic energy on the sphere", Pacific J. Math. 207 (2002);
// Borodachov, Hardin & Saff, Discrete Energy on Rectifiable Sets (2019), ch. 2).
import type { Configuration } from './types'
import { EngineInputError } from './errors'
import { pairSum } from './energy'

/** Checks that every point lies on S² to within `tolerance` in |x|; names the first point that does not. */
export function assertOnSphere(conf: Configuration, tolerance = 1e-9): void {
  if (conf.d !== 3) throw new EngineInputError(`points on the sphere need 3 coordinates (got ${conf.d})`)
  if (conf.points.length !== 3 * conf.N) throw new EngineInputError(`expected ${3 * conf.N} numbers for ${conf.N} points, got ${conf.points.length}`)
  for (let i = 0; i < conf.N; i++) {
    const x = conf.points[3 * i]
    const y = conf.points[3 * i + 1]
    const z = conf.points[3 * i + 2]
    const r = Math.sqrt(x * x + y * y + z * z)
    if (!(Math.abs(r - 1) <= tolerance)) throw new EngineInputError(`point ${i} is not on the unit sphere (|x| = ${r}, tolerance ${tolerance})`, { index: i })
  }
}

/** Σ_{i<j} |x_i − x_j|^(−s) on S². */
export function sphereRieszEnergy(conf: Configuration, s: number, tolerance = 1e-9): number {
  assertOnSphere(conf, tolerance)
  return pairSum(conf, { name: 'riesz', s }, { kind: 'sphere' })
}

/** Σ_{i<j} log(1/|x_i − x_j|) on S². */
export function sphereLogEnergy(conf: Configuration, tolerance = 1e-9): number {
  assertOnSphere(conf, tolerance)
  return pairSum(conf, { name: 'log' }, { kind: 'sphere' })
}

function configuration(coords: number[]): Configuration {
  return { N: coords.length / 3, d: 3, points: Float64Array.from(coords) }
}

/** Two antipodal points (poles). */
export function antipodalPair(): Configuration {
  return configuration([0, 0, 1, 0, 0, -1])
}

/** Three points at 120° on the equator. */
export function equatorialTriangle(): Configuration {
  const h = Math.sqrt(3) / 2
  return configuration([1, 0, 0, -0.5, h, 0, -0.5, -h, 0])
}

/** The regular tetrahedron (vertices (±1, ±1, ±1)/√3 with an even number of minus signs). */
export function regularTetrahedron(): Configuration {
  const c = 1 / Math.sqrt(3)
  return configuration([c, c, c, c, -c, -c, -c, c, -c, -c, -c, c])
}

/** Triangular bipyramid: both poles and an equatorial equilateral triangle. */
export function triangularBipyramid(): Configuration {
  const h = Math.sqrt(3) / 2
  return configuration([0, 0, 1, 0, 0, -1, 1, 0, 0, -0.5, h, 0, -0.5, -h, 0])
}

/** The regular octahedron (±e_k). */
export function regularOctahedron(): Configuration {
  return configuration([1, 0, 0, -1, 0, 0, 0, 1, 0, 0, -1, 0, 0, 0, 1, 0, 0, -1])
}

/** The minimising configuration for N = 2 … 6 (the same for s = 1 and for log). */
export function optimalSphereConfiguration(N: number): Configuration {
  switch (N) {
    case 2: return antipodalPair()
    case 3: return equatorialTriangle()
    case 4: return regularTetrahedron()
    case 5: return triangularBipyramid()
    case 6: return regularOctahedron()
    default: throw new EngineInputError(`known optimal configurations are built for N = 2 … 6 only (got ${N})`)
  }
}
