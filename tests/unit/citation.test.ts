// Our BibTeX read back by a reference parser (@citation-js/core with @citation-js/plugin-bibtex)
// must give the same title, authors, year and address as our CSL-JSON: the two formats are built
// from one record, and an independent reader checks the BibTeX escaping. People and titles are invented.
import { Cite } from '@citation-js/core'
import '@citation-js/plugin-bibtex'
import { describe, expect, it } from 'vitest'
import { bibtexEntry, bibtexEscape, citationFileName, citationKey, cslJsonItem, licenseSchema, splitPersonName } from '../../shared/utils/citation'
import type { CitationInput } from '../../shared/utils/citation'

interface ParsedItem {
  'title'?: string
  'author'?: Array<{ family?: string, given?: string }>
  'issued'?: { 'date-parts': number[][] }
  'URL'?: string
  'citation-key'?: string
  'id'?: string
  'version'?: string
  'note'?: string
}

function parseBibtex(text: string): ParsedItem[] {
  return new Cite(text).data as ParsedItem[]
}

const companion: CitationInput = {
  slug: 'harbour-lane-plasma',
  title: 'Next-order energies of {two-dimensional} plasmas: 50% & $β$_2 cases',
  abstract: 'Invented abstract.',
  manuscriptRef: 'HL-2026-07',
  authors: ['Zoë Ångström-Ōtake', 'Tobiah Wrennfield', 'Ïsa Łukasz-Çelik'],
  publishedAt: new Date('2026-11-18T09:30:00Z'),
  version: '0123456789abcdef0123456789abcdef01234567',
  license: 'CC-BY-4.0',
  siteUrl: 'https://quillfield.example/',
  engineVersion: '0.1.0',
}

const dataset: CitationInput = {
  ...companion,
  dataset: { id: 42, name: 'Ginibre samples, N = 400 # seeds 1–20', fileName: 'ginibre_400.npy', sha256: 'a'.repeat(64), configurationCount: 20, pointCount: 8000, convention: 'Σ_{i≠j} −log|x_i−x_j| + N Σ V(x_i); weight e^{−βH/2}' },
}

function expectSameAsCsl(input: CitationInput) {
  const [parsed] = parseBibtex(bibtexEntry(input))
  const ours = cslJsonItem(input)
  expect(parsed).toBeDefined()
  expect(parsed!.title).toBe(ours.title)
  expect(parsed!.author?.map(a => ({ family: a.family, given: a.given }))).toEqual(ours.author.map(a => ({ family: a.family, given: a.given })))
  expect(parsed!.issued?.['date-parts'][0]?.[0]).toBe(ours.issued?.['date-parts'][0]?.[0])
  expect(parsed!.URL).toBe(ours.URL)
  expect(parsed!.note).toBe(ours.note)
  return { parsed: parsed!, ours }
}

describe('citation of a companion', () => {
  it('BibTeX read back by citation-js agrees with our CSL-JSON', () => {
    const { parsed, ours } = expectSameAsCsl(companion)
    expect(ours.type).toBe('dataset')
    expect(ours.URL).toBe('https://quillfield.example/c/harbour-lane-plasma')
    expect(ours.issued).toEqual({ 'date-parts': [[2026, 11, 18]] })
    expect(parsed['citation-key']).toBe('qf:harbour-lane-plasma')
  })

  it('keeps accented names and TeX special characters through the round trip', () => {
    const { parsed } = expectSameAsCsl(companion)
    expect(parsed.author?.[0]).toMatchObject({ family: 'Ångström-Ōtake', given: 'Zoë' })
    expect(parsed.author?.[2]).toMatchObject({ family: 'Łukasz-Çelik', given: 'Ïsa' })
    expect(parsed.title).toBe('Next-order energies of {two-dimensional} plasmas: 50% & $β$_2 cases')
    // The raw BibTeX holds only escaped specials: an unescaped % would start a TeX comment (common practice).
    const title = /title\s*= \{(.*)\},\n/.exec(bibtexEntry(companion))![1]!
    expect(title).not.toMatch(/(?<!\\)[%&$_#]/)
  })

  it('writes each special and accented character as LaTeX does (Lamport 1994, table 3.1)', () => {
    expect(bibtexEscape('50% & $x$ a_b #1')).toBe('50\\% \\& \\$x\\$ a\\_b \\#1')
    expect(bibtexEscape('{x}')).toBe('\\{x\\}')
    expect(bibtexEscape('Zoë')).toBe('Zo{\\"{e}}')
    expect(bibtexEscape('Ō')).toBe('{\\={O}}')
    expect(bibtexEscape('Ç')).toBe('{\\c{C}}')
    expect(bibtexEscape('ï')).toBe('{\\"{\\i}}')
    expect(bibtexEscape('ß')).toBe('{\\ss}')
  })

  it('says "not yet published" and gives no year before publication', () => {
    const draft = { ...companion, publishedAt: null }
    const { parsed, ours } = expectSameAsCsl(draft)
    expect(ours.issued).toBeUndefined()
    expect(parsed.issued).toBeUndefined()
    expect(ours.note).toMatch(/^Not yet published/)
  })

  it('names the engine version, licence and revision in the note', () => {
    const { note, version } = cslJsonItem(companion)
    expect(note).toContain('Quillfield engine 0.1.0')
    expect(note).toContain('licence CC-BY-4.0')
    expect(note).toContain('revision 0123456789abcdef0123456789abcdef01234567')
    expect(version).toBe('0123456789ab')
  })
})

describe('citation of a dataset', () => {
  it('BibTeX read back agrees with CSL-JSON, with the dataset address and fingerprint', () => {
    const { parsed, ours } = expectSameAsCsl(dataset)
    expect(ours.URL).toBe('https://quillfield.example/c/harbour-lane-plasma/data/42')
    expect(ours['container-title']).toBe(companion.title)
    expect(ours.note).toContain(`SHA-256 ${'a'.repeat(64)}`)
    expect(ours.note).toContain('file ginibre_400.npy')
    expect(ours.note).toContain('20 configurations')
    expect(ours.note).toContain('8000 points')
    expect(ours.note).toContain('weight e^{−βH/2}')
    expect(parsed['citation-key']).toBe('qf:harbour-lane-plasma:data-42')
  })
})

describe('citation keys and file names', () => {
  it('are stable: the same whatever the revision, date or title', () => {
    const later = { ...companion, title: 'Another title', version: 'f'.repeat(40), publishedAt: new Date('2027-01-02T00:00:00Z') }
    expect(citationKey(later)).toBe(citationKey(companion))
    expect(citationKey({ ...dataset, version: null })).toBe(citationKey(dataset))
    expect(citationKey(companion)).not.toBe(citationKey(dataset))
    expect(citationFileName(dataset, 'bibtex')).toBe('qf-harbour-lane-plasma-data-42.bib')
    expect(citationFileName(companion, 'csl-json')).toBe('qf-harbour-lane-plasma.csl.json')
  })

  it('splits display names at the last word', () => {
    expect(splitPersonName('Zoë Ångström-Ōtake')).toEqual({ family: 'Ångström-Ōtake', given: 'Zoë' })
    expect(splitPersonName('  Orrin  ')).toEqual({ family: 'Orrin' })
  })
})

describe('licence choice', () => {
  it('accepts the four licences and refuses anything else', () => {
    for (const license of ['CC-BY-4.0', 'CC-BY-SA-4.0', 'CC0-1.0', 'ODC-By-1.0']) expect(licenseSchema.safeParse({ license }).success).toBe(true)
    expect(licenseSchema.safeParse({ license: 'CC-BY-NC-4.0' }).success).toBe(false)
    expect(licenseSchema.safeParse({}).success).toBe(false)
  })
})
