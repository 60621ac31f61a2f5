// Compensated summation. Neumaier's variant of Kahan's compensated sum keeps a running correction
// for the low-order bits lost in each addition, also when the new term is larger than the sum:
//   t = s + x;  c += |s| ≥ |x| ? (s − t) + x : (x − t) + s;  s = t;   result s + c.
// The error is bounded by 2ε|Σ|x_i|| + O(nε²)Σ|x_i|, independent of n to first order, so pair sums
// agree to rounding whatever the order of the terms. Sources: Kahan, Comm. ACM 8 (1965) 40;
// Neumaier, Z. Angew. Math. Mech. 54 (1974) 39–51; Higham, Accuracy and Stability of Numerical
// Algorithms, 2nd ed. (2002), §4.3.

/** A running compensated (Neumaier) sum. */
export class CompensatedSum {
  private s = 0
  private c = 0

  /** Adds one term. */
  add(x: number): this {
    const t = this.s + x
    if (Math.abs(this.s) >= Math.abs(x)) this.c += (this.s - t) + x
    else this.c += (x - t) + this.s
    this.s = t
    return this
  }

  /** Adds the value of another accumulator (both its parts). */
  addSum(other: CompensatedSum): this {
    this.add(other.s)
    this.add(other.c)
    return this
  }

  /** The compensated value s + c. */
  get value(): number {
    return this.s + this.c
  }
}

/** Σ values with Neumaier compensation. */
export function compensatedSum(values: ArrayLike<number>): number {
  const acc = new CompensatedSum()
  for (let i = 0; i < values.length; i++) acc.add(values[i])
  return acc.value
}

/** Σ_{i<j} f(i, j) over 0 ≤ i < j < n, in square blocks of `block` indices, each block summed with
 *  compensation and the block sums combined with compensation (deterministic order). */
export function blockedPairSum(n: number, f: (i: number, j: number) => number, block = 128): number {
  const total = new CompensatedSum()
  for (let bi = 0; bi < n; bi += block) {
    const iEnd = Math.min(n, bi + block)
    for (let bj = bi; bj < n; bj += block) {
      const jEnd = Math.min(n, bj + block)
      const part = new CompensatedSum()
      for (let i = bi; i < iEnd; i++) {
        for (let j = Math.max(bj, i + 1); j < jEnd; j++) part.add(f(i, j))
      }
      total.addSum(part)
    }
  }
  return total.value
}
