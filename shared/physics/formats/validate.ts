// Checks that an ensemble can be handed to the energy code of a geometry: finite coordinates,
// the right dimension, no two points at the same place (the pair energy g(0) is infinite for the
// log, Coulomb and Riesz kernels; Saff & Totik 1997, ch. 0), points on the unit sphere S² within
// a tolerance on | |x| − 1 |, and points inside the periodic cell [0, L)^d.
// Coincidences are found by sorting the points lexicographically, O(N log N) (Knuth, TAOCP
// vol. 3, §5.2: equal keys are adjacent after sorting).
import type { InputLocation } from '../errors'
import { EngineInputError } from '../errors'
import type { Configuration, Geometry } from '../types'
import type { PointEnsemble } from './ensemble'
import { describeLocation } from './location'

export type ProblemKind = 'read' | 'geometry' | 'dimension' | 'shape' | 'empty' | 'non-finite' | 'off-sphere' | 'outside-box' | 'coincident'

export interface EnsembleProblem {
  kind: ProblemKind
  /** The full message, starting with the file location when it is known. */
  message: string
  where: InputLocation
}

export interface ValidationOptions {
  geometry: Geometry
  /** Allowed | |x| − 1 | on the sphere; default 1e-9. */
  tolerance?: number
}

export const DEFAULT_SPHERE_TOLERANCE = 1e-9
const NAMES = ['x', 'y', 'z']

function coordinateName(k: number, d: number): string {
  return d <= 3 ? `${NAMES[k]} (coordinate ${k})` : `coordinate ${k}`
}

/** Pairs (i, j), i < j, of points with identical coordinates, sorted by i then j. */
export function findCoincidentPairs(c: Configuration): Array<[number, number]> {
  const { N, d, points } = c
  const order = new Uint32Array(N)
  for (let i = 0; i < N; i++) order[i] = i
  order.sort((a, b) => {
    for (let k = 0; k < d; k++) {
      const u = points[a * d + k]
      const v = points[b * d + k]
      if (u < v) return -1
      if (u > v) return 1
    }
    return a - b
  })
  const pairs: Array<[number, number]> = []
  for (let r = 1; r < N; r++) {
    const a = order[r - 1]
    const b = order[r]
    let same = true
    for (let k = 0; k < d && same; k++) same = points[a * d + k] === points[b * d + k]
    if (same) pairs.push(a < b ? [a, b] : [b, a])
  }
  pairs.sort((p, q) => p[0] - q[0] || p[1] - q[1])
  return pairs
}

/** Up to `maxProblems` (default 100) problems, in the order: geometry, dimension, then per configuration. */
export function collectProblems(ensemble: PointEnsemble, options: ValidationOptions & { maxProblems?: number }): EnsembleProblem[] {
  const max = Math.max(1, options.maxProblems ?? 100)
  const problems: EnsembleProblem[] = []
  const file = ensemble.fileName
  const add = (kind: ProblemKind, message: string, where: InputLocation): boolean => {
    const full: InputLocation = file === undefined ? where : { file, ...where }
    const prefix = describeLocation({ file: full.file, line: full.line, column: full.column })
    problems.push({ kind, message: prefix ? `${prefix}: ${message}` : message, where: full })
    return problems.length >= max
  }
  const { geometry } = options
  const tolerance = options.tolerance ?? DEFAULT_SPHERE_TOLERANCE
  if (!(tolerance >= 0)) {
    add('geometry', `the sphere tolerance must be a number ≥ 0 (got ${tolerance})`, {})
    return problems
  }
  if (geometry.kind === 'torus' && !(Number.isFinite(geometry.L) && geometry.L > 0)) {
    add('geometry', `the torus side L must be a finite number > 0 (got ${geometry.L})`, {})
    return problems
  }
  const d = ensemble.d
  if (geometry.kind === 'sphere') {
    if (d !== 3) {
      add('dimension', `points on the unit sphere S² are stored with exactly 3 coordinates (x, y, z), but the points have ${d}`, {})
      return problems
    }
  }
  else if (d !== geometry.d) {
    const space = geometry.kind === 'free' ? `free space R^${geometry.d}` : `the torus [0, L)^${geometry.d}`
    add('dimension', `the geometry is ${space}, but the points have ${d} coordinate${d === 1 ? '' : 's'}`, {})
    return problems
  }
  if (ensemble.configurations.length === 0) {
    add('empty', 'the ensemble has no configurations', {})
    return problems
  }
  for (let m = 0; m < ensemble.configurations.length; m++) {
    const c = ensemble.configurations[m]
    const lines = ensemble.pointLines?.[m]
    const at = (i: number): InputLocation => (lines !== undefined && i < lines.length ? { configuration: m, index: i, line: lines[i] } : { configuration: m, index: i })
    if (c.d !== d || c.points.length !== c.N * c.d) {
      if (add('shape', `configuration ${m} is malformed: d = ${c.d} (ensemble d = ${d}), N = ${c.N}, ${c.points.length} values`, { configuration: m })) return problems
      continue
    }
    if (c.N === 0) {
      if (add('empty', `configuration ${m} has no points`, { configuration: m })) return problems
      continue
    }
    const p = c.points
    let allFinite = true
    for (let i = 0; i < c.N; i++) {
      for (let k = 0; k < d; k++) {
        const x = p[i * d + k]
        if (!Number.isFinite(x)) {
          allFinite = false
          if (add('non-finite', `configuration ${m}, point ${i}: ${coordinateName(k, d)} is ${x}`, at(i))) return problems
        }
      }
    }
    if (geometry.kind === 'sphere') {
      for (let i = 0; i < c.N; i++) {
        const x = p[3 * i]
        const y = p[3 * i + 1]
        const z = p[3 * i + 2]
        if (!(Number.isFinite(x) && Number.isFinite(y) && Number.isFinite(z))) continue
        const deviation = Math.abs(Math.sqrt(x * x + y * y + z * z) - 1)
        if (deviation > tolerance) {
          if (add('off-sphere', `configuration ${m}, point ${i} is off the unit sphere: | |x| − 1 | = ${deviation.toPrecision(3)} exceeds the tolerance ${tolerance}`, at(i))) return problems
        }
      }
    }
    else if (geometry.kind === 'torus') {
      const L = geometry.L
      for (let i = 0; i < c.N; i++) {
        for (let k = 0; k < d; k++) {
          const x = p[i * d + k]
          if (Number.isFinite(x) && !(x >= 0 && x < L)) {
            if (add('outside-box', `configuration ${m}, point ${i}: ${coordinateName(k, d)} = ${x} is outside the box [0, ${L})`, at(i))) return problems
          }
        }
      }
    }
    if (allFinite) {
      for (const [i, j] of findCoincidentPairs(c)) {
        const lineNote = lines !== undefined && j < lines.length ? ` (lines ${lines[i]} and ${lines[j]})` : ''
        const where: InputLocation = { ...at(j), indices: [i, j] }
        if (add('coincident', `configuration ${m}: points ${i} and ${j} coincide${lineNote}; their pair energy is infinite`, where)) return problems
      }
    }
  }
  return problems
}

/** Returns the ensemble when it passes every check, else throws an EngineInputError for the first problem. */
export function validateEnsemble(ensemble: PointEnsemble, options: ValidationOptions): PointEnsemble {
  const [first] = collectProblems(ensemble, { ...options, maxProblems: 1 })
  if (first !== undefined) throw new EngineInputError(first.message, first.where)
  return ensemble
}
