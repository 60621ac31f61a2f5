// Observation windows for spatial statistics: a ball B(c, R) in free space (an interval in d = 1, a
// disk in d = 2) or the whole periodic box [0, L)^d. The default window of a free-space sample is the
// bulk of the equilibrium measure: the support ball shrunk by a chosen fraction (common practice).
import type { EquilibriumMeasure } from '../equilibrium/types'
import { EngineInputError } from '../errors'
import { unitSphereArea } from '../kernels'

export type Window
  = | { kind: 'ball', center: number[], radius: number }
    | { kind: 'torus', L: number }

/** Volume of the ball of radius r in R^d: |S^{d−1}| r^d / d. */
export function ballVolume(d: number, r: number): number {
  return (unitSphereArea(d) * Math.pow(r, d)) / d
}

export function windowVolume(win: Window, d: number): number {
  return win.kind === 'torus' ? Math.pow(win.L, d) : ballVolume(d, win.radius)
}

export function describeWindow(win: Window, d: number): string {
  if (win.kind === 'torus') return `periodic box [0, ${win.L})^${d}, minimum-image distances`
  const name = d === 1 ? 'interval' : d === 2 ? 'disk' : 'ball'
  return `${name} of radius ${win.radius} centred at (${win.center.join(', ')})`
}

export function checkWindow(win: Window, d: number, what: string): void {
  if (win.kind === 'torus') {
    if (!(win.L > 0) || !Number.isFinite(win.L)) throw new EngineInputError(`${what}: the box side L must be a finite number > 0 (got ${win.L})`)
    return
  }
  if (win.center.length !== d) throw new EngineInputError(`${what}: the window centre has ${win.center.length} coordinates, the points have ${d}`)
  if (!(win.radius > 0) || !Number.isFinite(win.radius)) throw new EngineInputError(`${what}: the window radius must be a finite number > 0 (got ${win.radius})`)
}

/** True when the point at points[offset…] lies in the window (always true on the torus). */
export function inWindow(win: Window, points: ArrayLike<number>, offset: number, d: number): boolean {
  if (win.kind === 'torus') return true
  return distanceToCentre(win, points, offset, d) <= win.radius
}

export function distanceToCentre(win: { center: number[] }, points: ArrayLike<number>, offset: number, d: number): number {
  let s = 0
  for (let k = 0; k < d; k++) s += (points[offset + k] - win.center[k]) ** 2
  return Math.sqrt(s)
}

/** The support ball of a measure shrunk to `fraction` of its radius. */
export function bulkWindow(measure: EquilibriumMeasure, fraction: number): Window {
  if (!(fraction > 0 && fraction <= 1)) throw new EngineInputError(`the bulk fraction must lie in (0, 1] (got ${fraction})`)
  const s = measure.support
  if (s.kind === 'ball') return { kind: 'ball', center: [...s.center], radius: s.radius * fraction }
  if (s.kind === 'annulus') return { kind: 'ball', center: [0, 0], radius: s.outer * fraction }
  if (s.kind === 'intervals') {
    const lo = Math.min(...s.intervals.map(i => i[0]))
    const hi = Math.max(...s.intervals.map(i => i[1]))
    return { kind: 'ball', center: [(lo + hi) / 2], radius: ((hi - lo) / 2) * fraction }
  }
  throw new EngineInputError('the measure is uniform on a sphere or a torus: give the window (the torus box) explicitly')
}
