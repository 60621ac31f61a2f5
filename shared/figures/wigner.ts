// Wigner surmise for the nearest-neighbour spacing of β-ensembles at unit mean spacing
// (Mehta, Random Matrices, 3rd ed., 2004, §1.5 and appendix A.8):
//   p₁(s) = (π/2) s e^{−πs²/4},  p₂(s) = (32/π²) s² e^{−4s²/π},  p₄(s) = (2¹⁸/(3⁶π³)) s⁴ e^{−64s²/(9π)}.
import { EngineInputError } from '../physics/errors'

export type SurmiseBeta = 1 | 2 | 4

export function wignerSurmise(beta: SurmiseBeta, s: number): number {
  if (s < 0) return 0
  if (beta === 1) return (Math.PI / 2) * s * Math.exp((-Math.PI * s * s) / 4)
  if (beta === 2) return (32 / (Math.PI * Math.PI)) * s * s * Math.exp((-4 * s * s) / Math.PI)
  if (beta === 4) return (2 ** 18 / (3 ** 6 * Math.PI ** 3)) * s ** 4 * Math.exp((-64 * s * s) / (9 * Math.PI))
  throw new EngineInputError(`Wigner surmise: β must be 1, 2 or 4, got ${String(beta)}`)
}

/** The surmise sampled on `points` equally spaced s in [0, sMax]. */
export function surmiseCurve(beta: SurmiseBeta, sMax: number, points = 121): Array<{ s: number, p: number }> {
  if (!(sMax > 0)) throw new EngineInputError(`Wigner surmise: the range [0, ${sMax}] is empty`)
  const out: Array<{ s: number, p: number }> = []
  for (let i = 0; i < points; i++) {
    const s = (sMax * i) / (points - 1)
    out.push({ s, p: wignerSurmise(beta, s) })
  }
  return out
}
