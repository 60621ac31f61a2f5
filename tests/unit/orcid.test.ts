import { describe, expect, it } from 'vitest'
import { mod11_2CheckCharacter, researcherIdProblem } from '../../shared/utils/orcid'

describe('researcher identifiers (ISO/IEC 7064 MOD 11-2)', () => {
  it('computes the check character by the standard recurrence', () => {
    // Worked by hand from the ISO/IEC 7064 MOD 11-2 recurrence t ← (t + d)·2, check = (12 − t mod 11) mod 11:
    // digits 000000021825009 give t mod 11 = 5, so the check is 7. The identifier 0000-0002-1825-0097 is also
    // the example printed in ORCID's public documentation of the checksum (value recalled from memory).
    expect(mod11_2CheckCharacter('000000021825009')).toBe('7')
    // A check value of 10 is written X (ISO/IEC 7064): digits 000000021694233 give t mod 11 = 2 → 10 → X
    // (the example with X in the same documentation, 0000-0002-1694-233X; value recalled from memory).
    expect(mod11_2CheckCharacter('000000021694233')).toBe('X')
  })

  it('accepts well-formed identifiers and explains what is wrong with others', () => {
    expect(researcherIdProblem('0000-0002-1825-0097')).toBeNull()
    expect(researcherIdProblem('0000-0002-1694-233X')).toBeNull()
    expect(researcherIdProblem('0000-0002-1825-0098')).toMatch(/check digit/)
    expect(researcherIdProblem('0000000218250097')).toMatch(/form/)
    expect(researcherIdProblem('0000-0002-1825-009')).toMatch(/form/)
  })

  it('catches every single-digit typing slip (a property of MOD 11-2)', () => {
    const base = '000000021825009'
    for (let position = 0; position < base.length; position++) {
      for (let digit = 0; digit <= 9; digit++) {
        if (String(digit) === base[position]) continue
        const slipped = base.slice(0, position) + digit + base.slice(position + 1)
        expect(mod11_2CheckCharacter(slipped)).not.toBe('7')
      }
    }
  })
})
