// Recognising a closed-form preset behind a potential given as an expression: if V(x) = a|x|²
// at a set of probe points (to rounding), the closed-form equilibrium measures of the quadratic
// preset apply. The probe test is exact for polynomials of degree ≤ 2 in |x| once it passes at
// more points than free coefficients; other functions would have to agree with a|x|² at every probe.
import { quadraticPotential } from './presets'
import type { Potential } from './types'

const probes = [0.3, 0.7, 1.1, 1.9, 2.6]

/** The same potential with `preset` set when it is a|x|² (a > 0); otherwise the potential itself. */
export function withRecognisedPreset(potential: Potential): Potential {
  if (potential.preset) return potential
  const d = potential.d
  const point = new Float64Array(d)
  point[0] = 1
  const a = potential.value(point, 0)
  if (!(a > 0) || !Number.isFinite(a)) return potential
  for (let k = 0; k < probes.length; k++) {
    point.fill(0)
    // Probe along different directions as well as radii.
    for (let i = 0; i < d; i++) point[i] = probes[k] * Math.cos(k + 2 * i) / Math.sqrt(d)
    let r2 = 0
    for (let i = 0; i < d; i++) r2 += point[i] * point[i]
    const expected = a * r2
    if (Math.abs(potential.value(point, 0) - expected) > 1e-12 * Math.max(1, Math.abs(expected))) return potential
  }
  point.fill(0)
  if (Math.abs(potential.value(point, 0)) > 1e-14) return potential
  const preset = quadraticPotential(a, d)
  return { ...preset, text: potential.text, latex: potential.latex }
}
