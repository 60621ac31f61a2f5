// Researcher identifiers of the form 0000-0000-0000-000X. The last character is a check
// digit computed with ISO/IEC 7064 MOD 11-2 over the first fifteen digits (X stands for 10).

/** The MOD 11-2 check character for a string of decimal digits. */
export function mod11_2CheckCharacter(digits: string): string {
  let total = 0
  for (const ch of digits) {
    const digit = ch.charCodeAt(0) - 48
    if (digit < 0 || digit > 9) throw new RangeError(`not a decimal digit: ${ch}`)
    total = (total + digit) * 2
  }
  const result = (12 - (total % 11)) % 11
  return result === 10 ? 'X' : String(result)
}

/** Why an identifier is not valid, or null when it is. */
export function researcherIdProblem(value: string): string | null {
  if (!/^\d{4}-\d{4}-\d{4}-\d{3}[\dX]$/.test(value)) return 'use the form 0000-0000-0000-000X (four groups of four, the last may end in X)'
  const digits = value.replaceAll('-', '')
  if (mod11_2CheckCharacter(digits.slice(0, 15)) !== digits[15]) return 'the last character is not the check digit of the other fifteen; check for a typing slip'
  return null
}
