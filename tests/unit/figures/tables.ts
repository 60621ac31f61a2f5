// Small result tables, built in code, shaped like the engine's statistic tables.
import type { ResultTable } from '../../../shared/figures/types'

const base = { convention: 'canonical: log kernel, d = 2', engineVersion: '0.1.0', inputHash: 'ab12' }

/** One row per configuration, energy per point exactly a + b·log N/N + c/N times N. */
export function nextOrderTable(coef: { a: number, b: number, c: number }, Ns: number[], perN = 1, noise: (i: number) => number = () => 0): ResultTable {
  const rows: ResultTable['rows'] = []
  let i = 0
  for (const N of Ns) {
    for (let k = 0; k < perN; k++) {
      const e = coef.a + (coef.b * Math.log(N)) / N + coef.c / N + noise(i++)
      rows.push({ configuration: rows.length, N, nextOrder: e * N })
    }
  }
  return { ...base, computation: 'c-next', quantity: 'next-order', columns: [{ name: 'configuration', label: 'configuration' }, { name: 'N', label: 'N' }, { name: 'nextOrder', label: 'F_N' }], rows }
}

export function spacingTable(): ResultTable {
  const rows: ResultTable['rows'] = []
  const w = 0.25
  for (let b = 0; b < 12; b++) {
    const s = (b + 0.5) * w
    // bins filled with the β = 2 Wigner surmise (Mehta 2004), synthetic data
    const d = (32 / (Math.PI * Math.PI)) * s * s * Math.exp((-4 * s * s) / Math.PI)
    rows.push({ s, sLow: b * w, sHigh: (b + 1) * w, density: d, error: 0.02, lower: d - 0.02, upper: d + 0.02, count: 10 })
  }
  return {
    ...base,
    computation: 'c-spacing',
    quantity: 'statistic:spacing',
    columns: ['s', 'sLow', 'sHigh', 'density', 'error', 'lower', 'upper', 'count'].map(name => ({ name, label: name })),
    rows,
  }
}

export function pairTable(withReference: boolean): ResultTable {
  const rows: ResultTable['rows'] = []
  for (let i = 1; i <= 10; i++) {
    const r = i * 0.2
    const g = 1 - Math.exp(-Math.PI * r * r)
    rows.push({ r, g, error: 0.01, lower: g - 0.01, upper: g + 0.01, ...(withReference ? { reference: 1 } : {}) })
  }
  const names = ['r', 'g', 'error', 'lower', 'upper', ...(withReference ? ['reference'] : [])]
  return { ...base, computation: 'c-pair', quantity: 'statistic:pair-correlation', columns: names.map(name => ({ name, label: name === 'reference' ? 'Poisson process' : name })), rows }
}

export function structureTable(): ResultTable {
  const rows: ResultTable['rows'] = [{ k: 0, S: 0, lower: null, upper: null }]
  for (let i = 1; i <= 8; i++) {
    const k = 0.3 * i
    const S = (k * k) / (4 * Math.PI)
    rows.push({ k, S, error: S * 0.1, lower: S * 0.9, upper: S * 1.1, vectors: 4 })
  }
  return { ...base, computation: 'c-sk', quantity: 'statistic:structure-factor', columns: ['k', 'S', 'error', 'lower', 'upper', 'vectors'].map(name => ({ name, label: name })), rows }
}

export function configurationTable(points: number, twoD: boolean): ResultTable {
  const rows: ResultTable['rows'] = []
  for (let i = 0; i < points; i++) {
    const t = (2 * Math.PI * i) / points
    rows.push({ configuration: 0, index: i, x: Math.cos(t) * (i % 3 + 1), ...(twoD ? { y: Math.sin(t) * (i % 3 + 1) } : {}), abs: (i % 5) / 4 })
  }
  rows.push({ configuration: 1, index: 0, x: 9, ...(twoD ? { y: 9 } : {}), abs: 0 })
  const names = ['configuration', 'index', 'x', ...(twoD ? ['y'] : []), 'abs']
  return { ...base, computation: 'c-psi6', quantity: 'statistic:psi6', columns: names.map(name => ({ name, label: name === 'abs' ? '|ψ₆|' : name })), rows }
}

export function densityTable(): ResultTable {
  const rows: ResultTable['rows'] = []
  for (let i = 0; i < 10; i++) {
    const x = -1.8 + 0.4 * i
    // semicircle density √(4 − x²)/(2π) (Wigner; Saff & Totik 1997, ch. IV), with a 2% excess as the 'empirical' values
    const eq = Math.sqrt(Math.max(0, 4 - x * x)) / (2 * Math.PI)
    rows.push({ x, density: eq * 1.02, error: 0.005, lower: eq * 1.02 - 0.005, upper: eq * 1.02 + 0.005, equilibrium: eq })
  }
  return { ...base, computation: 'c-density', quantity: 'statistic:density', columns: ['x', 'density', 'error', 'lower', 'upper', 'equilibrium'].map(name => ({ name, label: name, ...(name === 'x' ? { unit: 'rescaled' } : {}) })), rows }
}
