import { describe, expect, it } from 'vitest'
import { compareDeclared } from '../../shared/utils/declared'

describe('declared values against recomputed ones', () => {
  const rows = [{ H: 10 }, { H: -2 }, { H: 0 }, { H: 'n/a' }]

  it('uses max(absolute, relative·|declared|) as the allowed difference', () => {
    const c = compareDeclared({ column: 'H', values: [10.000001, -2.1, 1e-13, 5], relativeTolerance: 1e-6, absoluteTolerance: 1e-12, source: '' }, rows)
    expect(c.rows.map(r => r.agrees)).toEqual([true, false, true, null])
    expect(c.rows[0]!.allowed).toBeCloseTo(1.0000001e-5, 15)
    expect(c.rows[2]!.allowed).toBe(1e-12)
    expect(c).toMatchObject({ agreeing: 2, differing: 1, missing: 1, verdict: 'differ' })
    expect(c.tolerance).toBe('agree when |recomputed − declared| ≤ max(1e-12, 0.000001·|declared|)')
  })

  it('agrees only when every value is compared and within tolerance', () => {
    expect(compareDeclared({ column: 'H', values: [10, -2, 0], relativeTolerance: 0, absoluteTolerance: 0, source: '' }, rows).verdict).toBe('agree')
    expect(compareDeclared({ column: 'H', values: [10, null], relativeTolerance: 0, absoluteTolerance: 0, source: '' }, rows).verdict).toBe('incomplete')
  })
})
