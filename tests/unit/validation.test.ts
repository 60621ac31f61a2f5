import { describe, expect, it } from 'vitest'
import { companionCreateSchema, fieldErrors, signUpSchema } from '../../shared/utils/validation'
import { roleAtLeast } from '../../shared/types/roles'

describe('shared validation', () => {
  it('normalises e-mail addresses to lower case without surrounding spaces', () => {
    const parsed = signUpSchema.parse({ email: '  Someone@Institute.EXAMPLE ', password: 'long enough!', displayName: 'Someone' })
    expect(parsed.email).toBe('someone@institute.example')
  })

  it('reports one message per field', () => {
    const result = signUpSchema.safeParse({ email: 'x', password: 'short', displayName: '' })
    expect(result.success).toBe(false)
    if (!result.success) expect(Object.keys(fieldErrors(result.error)).sort()).toEqual(['displayName', 'email', 'password'])
  })

  it('accepts short names of lower-case words joined by single hyphens only', () => {
    expect(companionCreateSchema.safeParse({ title: 'A title', slug: 'plasma-next-order' }).success).toBe(true)
    for (const slug of ['ab', 'Plasma', 'two--hyphens', '-leading', 'trailing-', 'space here', 'a/b']) {
      expect(companionCreateSchema.safeParse({ title: 'A title', slug }).success, slug).toBe(slug === 'Plasma')
    }
  })

  it('orders companion roles reader < reviewer < author < editor', () => {
    expect(roleAtLeast('editor', 'author')).toBe(true)
    expect(roleAtLeast('author', 'reviewer')).toBe(true)
    expect(roleAtLeast('reviewer', 'author')).toBe(false)
    expect(roleAtLeast('reader', 'reviewer')).toBe(false)
    expect(roleAtLeast(null, 'reader')).toBe(false)
  })
})
