// Reading and writing decimal numbers so that doubles survive a round trip bit for bit.
// Reading: the decimal floating-point syntax [+-] digits [. digits] [(e|E) [+-] digits], plus
// inf / infinity / nan (any case, signed), converted with correct rounding (ECMA-262, §7.1.4.1.1
// StringToNumber). Writing: the shortest decimal string that reads back to the same double
// (ECMA-262, §6.1.6.1.20 Number::toString; Steele & White, PLDI 1990), with "-0" kept.

/** The number written in t[s, e), or undefined when that text is not a decimal number. */
export function parseDecimal(t: string, s: number, e: number): number | undefined {
  let i = s
  let c = t.charCodeAt(i)
  let negative = false
  if (c === 43 || c === 45) {
    negative = c === 45
    i++
    c = t.charCodeAt(i)
  }
  if (i >= e) return undefined
  if (c === 105 || c === 73 || c === 110 || c === 78) {
    const word = t.slice(i, e).toLowerCase()
    if (word === 'inf' || word === 'infinity') return negative ? -Infinity : Infinity
    if (word === 'nan') return NaN
    return undefined
  }
  let digits = 0
  while (i < e) {
    c = t.charCodeAt(i)
    if (c < 48 || c > 57) break
    i++
    digits++
  }
  if (i < e && t.charCodeAt(i) === 46) {
    i++
    while (i < e) {
      c = t.charCodeAt(i)
      if (c < 48 || c > 57) break
      i++
      digits++
    }
  }
  if (digits === 0) return undefined
  if (i < e) {
    c = t.charCodeAt(i)
    if (c !== 101 && c !== 69) return undefined
    i++
    c = t.charCodeAt(i)
    if (c === 43 || c === 45) i++
    let exponentDigits = 0
    while (i < e) {
      c = t.charCodeAt(i)
      if (c < 48 || c > 57) break
      i++
      exponentDigits++
    }
    if (exponentDigits === 0 || i !== e) return undefined
  }
  return Number(t.slice(s, e))
}

/** Shortest round-trip decimal form of x; "-0" for negative zero; "NaN", "Infinity", "-Infinity". */
export function formatNumber(x: number): string {
  if (x === 0) return Object.is(x, -0) ? '-0' : '0'
  return String(x)
}
