// Comparing values the authors declare (e.g. the numbers printed in the manuscript) with the
// recomputed ones: a row agrees when |recomputed − declared| ≤ max(absolute, relative·|declared|).
import { z } from 'zod'

export const declaredSchema = z.object({
  column: z.string().trim().min(1, 'Name the column the values belong to.').max(120),
  values: z.array(z.number().finite().nullable()).min(1, 'Give at least one value.').max(10_000, 'At most 10 000 values.'),
  relativeTolerance: z.number().min(0, 'A tolerance is not negative.').max(1).default(1e-6),
  absoluteTolerance: z.number().min(0, 'A tolerance is not negative.').default(0),
  source: z.string().trim().max(300).default(''),
})

export type DeclaredInput = z.infer<typeof declaredSchema>

export interface DeclaredRow {
  row: number
  declared: number | null
  recomputed: number | null
  difference: number | null
  allowed: number | null
  agrees: boolean | null
}

export interface DeclaredComparison {
  column: string
  rows: DeclaredRow[]
  agreeing: number
  differing: number
  missing: number
  verdict: 'agree' | 'differ' | 'incomplete'
  /** The tolerance in words, shown beside every comparison. */
  tolerance: string
}

export function toleranceText(relative: number, absolute: number): string {
  return `agree when |recomputed − declared| ≤ max(${absolute}, ${relative}·|declared|)`
}

export function compareDeclared(declared: DeclaredInput, rows: Array<Record<string, number | string | null>>): DeclaredComparison {
  const out: DeclaredRow[] = declared.values.map((value, row) => {
    const cell = rows[row]?.[declared.column]
    const recomputed = typeof cell === 'number' && Number.isFinite(cell) ? cell : null
    if (value === null || recomputed === null) return { row, declared: value, recomputed, difference: null, allowed: null, agrees: null }
    const difference = Math.abs(recomputed - value)
    const allowed = Math.max(declared.absoluteTolerance, declared.relativeTolerance * Math.abs(value))
    return { row, declared: value, recomputed, difference, allowed, agrees: difference <= allowed }
  })
  const agreeing = out.filter(r => r.agrees === true).length
  const differing = out.filter(r => r.agrees === false).length
  const missing = out.filter(r => r.agrees === null).length
  return {
    column: declared.column,
    rows: out,
    agreeing,
    differing,
    missing,
    verdict: differing > 0 ? 'differ' : missing > 0 ? 'incomplete' : 'agree',
    tolerance: toleranceText(declared.relativeTolerance, declared.absoluteTolerance),
  }
}
