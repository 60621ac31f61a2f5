// Citations of a companion and of its datasets (ensembles), in BibTeX and CSL-JSON, built from one
// record so the two never disagree. BibTeX escaping follows the LaTeX conventions for special
// characters and accented letters (Lamport, LaTeX: A Document Preparation System, 2nd ed. 1994,
// §3.2 and table 3.1; Patashnik, BibTeXing, 1988, §4 on braces and names); CSL-JSON follows the
// Citation Style Language 1.0.2 schema (citationstyles.org), type "dataset".
import { z } from 'zod'

export const LICENSE_IDS = ['CC-BY-4.0', 'CC-BY-SA-4.0', 'CC0-1.0', 'ODC-By-1.0'] as const
export type LicenseId = typeof LICENSE_IDS[number]

export const licenseSchema = z.object({
  license: z.enum(LICENSE_IDS, { message: 'Choose one of CC-BY-4.0, CC-BY-SA-4.0, CC0-1.0 or ODC-By-1.0.' }),
})

/** Each licence in plain words, with the address of its official deed or text. */
export const LICENSE_INFO: Record<LicenseId, { name: string, summary: string, url: string }> = {
  'CC-BY-4.0': {
    name: 'Creative Commons Attribution 4.0',
    summary: 'Anyone may copy, change and reuse the data, also commercially, as long as they credit the authors and say what they changed.',
    url: 'https://creativecommons.org/licenses/by/4.0/',
  },
  'CC-BY-SA-4.0': {
    name: 'Creative Commons Attribution-ShareAlike 4.0',
    summary: 'As Attribution, and whatever is made from the data must be shared under the same licence.',
    url: 'https://creativecommons.org/licenses/by-sa/4.0/',
  },
  'CC0-1.0': {
    name: 'Creative Commons Zero 1.0 (public domain dedication)',
    summary: 'The authors give up their rights as far as the law allows: reuse without conditions. Citing remains good scholarly practice.',
    url: 'https://creativecommons.org/publicdomain/zero/1.0/',
  },
  'ODC-By-1.0': {
    name: 'Open Data Commons Attribution 1.0',
    summary: 'A licence written for databases: reuse freely, crediting the authors and keeping the licence notice with the data.',
    url: 'https://opendatacommons.org/licenses/by/1-0/',
  },
}

export const citeQuerySchema = z.object({
  format: z.enum(['bibtex', 'csl-json'], { message: 'The format is bibtex or csl-json.' }),
  ensemble: z.coerce.number({ message: 'The ensemble is a number.' }).int('The ensemble is a whole number.').positive('The ensemble is a positive number.').optional(),
})

export const publishedQuerySchema = z.object({
  q: z.string().trim().max(200, 'Search with at most 200 characters.').optional().default(''),
  page: z.coerce.number({ message: 'The page is a number.' }).int('The page is a whole number.').min(1, 'Pages start at 1.').max(10_000, 'There are not that many pages.').optional().default(1),
})

/** What is cited: the companion, or one of its datasets. */
export interface CitationInput {
  slug: string
  title: string
  abstract?: string
  manuscriptRef?: string
  /** Display names of the members with the role author, in the order they joined. */
  authors: string[]
  publishedAt: Date | string | null
  /** The published revision, or the current head for an unpublished companion. */
  version: string | null
  license: LicenseId
  siteUrl: string
  engineVersion: string
  dataset?: {
    id: number
    name: string
    fileName: string
    sha256: string
    configurationCount: number
    pointCount: number
    /** The convention record in words (conventionLabel). */
    convention: string
  }
}

export interface PersonName { family: string, given?: string }

/** A display name as family and given names: the last word is the family name ("Zoë Ångström-Ōtake"). */
export function splitPersonName(displayName: string): PersonName {
  const words = displayName.trim().split(/\s+/).filter(Boolean)
  if (words.length <= 1) return { family: words[0] ?? '' }
  return { family: words[words.length - 1]!, given: words.slice(0, -1).join(' ') }
}

/** Our own key form: qf:<slug> for a companion, qf:<slug>:data-<id> for a dataset; it never changes with revisions. */
export function citationKey(input: Pick<CitationInput, 'slug' | 'dataset'>): string {
  return input.dataset ? `qf:${input.slug}:data-${input.dataset.id}` : `qf:${input.slug}`
}

export function citationUrl(input: Pick<CitationInput, 'slug' | 'siteUrl' | 'dataset'>): string {
  const base = `${input.siteUrl.replace(/\/+$/, '')}/c/${input.slug}`
  return input.dataset ? `${base}/data/${input.dataset.id}` : base
}

function dateOf(value: Date | string | null): Date | null {
  if (!value) return null
  const date = value instanceof Date ? value : new Date(value)
  return Number.isNaN(date.getTime()) ? null : date
}

function shortVersion(version: string | null): string | null {
  return version ? version.slice(0, 12) : null
}

/** The note both formats carry: what it is, the engine version, the licence, and a dataset's fingerprint. */
export function citationNote(input: CitationInput): string {
  const parts: string[] = []
  if (!dateOf(input.publishedAt)) parts.push('Not yet published')
  parts.push(input.dataset ? `Dataset of a Quillfield companion (${input.title})` : 'Quillfield companion')
  if (input.manuscriptRef) parts.push(`manuscript ${input.manuscriptRef}`)
  if (input.version) parts.push(`revision ${input.version}`)
  parts.push(`Quillfield engine ${input.engineVersion}`)
  parts.push(`licence ${input.license}`)
  if (input.dataset) {
    const d = input.dataset
    parts.push(`file ${d.fileName}`, `SHA-256 ${d.sha256}`, `${d.configurationCount} configuration${d.configurationCount === 1 ? '' : 's'}`, `${d.pointCount} points`, `convention ${d.convention}`)
  }
  return parts.join('; ')
}

function titleOf(input: CitationInput): string {
  return input.dataset ? `${input.dataset.name} (dataset of ${input.title})` : input.title
}

// ── CSL-JSON ──

export interface CslItem {
  'id': string
  'type': 'dataset'
  'title': string
  'author': PersonName[]
  'issued'?: { 'date-parts': number[][] }
  'URL': string
  'version'?: string
  'publisher': string
  'note': string
  'license': string
  'abstract'?: string
  'container-title'?: string
  'medium'?: string
}

export function cslJsonItem(input: CitationInput): CslItem {
  const published = dateOf(input.publishedAt)
  const item: CslItem = {
    id: citationKey(input),
    type: 'dataset',
    title: titleOf(input),
    author: input.authors.map(splitPersonName),
    URL: citationUrl(input),
    publisher: 'Quillfield',
    note: citationNote(input),
    license: input.license,
  }
  if (published) item.issued = { 'date-parts': [[published.getUTCFullYear(), published.getUTCMonth() + 1, published.getUTCDate()]] }
  const version = shortVersion(input.version)
  if (version) item.version = version
  if (input.dataset) {
    item['container-title'] = input.title
    item.medium = input.dataset.fileName
  }
  else if (input.abstract) item.abstract = input.abstract
  return item
}

/** The CSL-JSON document: an array of items, as the schema's citation lists are. */
export function cslJson(input: CitationInput): string {
  return `${JSON.stringify([cslJsonItem(input)], null, 2)}\n`
}

// ── BibTeX ──

// Combining marks (after NFD) and the LaTeX accent command that writes each.
const ACCENTS: Record<string, string> = {
  '\u0300': '`', '\u0301': '\'', '\u0302': '^', '\u0303': '~', '\u0304': '=', '\u0306': 'u', '\u0307': '.',
  '\u0308': '"', '\u030A': 'r', '\u030B': 'H', '\u030C': 'v', '\u0327': 'c', '\u0328': 'k', '\u0323': 'd', '\u0331': 'b',
}

// Letters that are not a base letter with an accent, and the LaTeX command for each.
const LETTERS: Record<string, string> = {
  'ß': '{\\ss}', 'æ': '{\\ae}', 'Æ': '{\\AE}', 'œ': '{\\oe}', 'Œ': '{\\OE}', 'ø': '{\\o}', 'Ø': '{\\O}',
  'ł': '{\\l}', 'Ł': '{\\L}', 'ı': '{\\i}', '–': '--', '—': '---',
  '‘': '`', '’': '\'', '“': '``', '”': '\'\'', '\u00A0': '~',
}

// Characters special to TeX, written so that they print as themselves.
const SPECIAL: Record<string, string> = {
  '\\': '{\\textbackslash}', '{': '\\{', '}': '\\}', '%': '\\%', '&': '\\&', '$': '\\$', '#': '\\#', '_': '\\_',
  '~': '{\\textasciitilde}', '^': '{\\textasciicircum}',
}

/**
 * Text as a BibTeX field value: TeX specials escaped, accented Latin letters as accent commands in
 * braces (so that styles keep their case), other non-ASCII characters left as UTF-8 (read by
 * biber and by BibTeX under inputenc).
 */
export function bibtexEscape(text: string): string {
  let out = ''
  for (const ch of text.normalize('NFC')) {
    if (SPECIAL[ch]) out += SPECIAL[ch]
    else if (LETTERS[ch]) out += LETTERS[ch]
    else if (ch.charCodeAt(0) < 128) out += ch
    else {
      const [base, ...marks] = [...ch.normalize('NFD')]
      if (base && base.charCodeAt(0) < 128 && marks.length > 0 && marks.every(m => ACCENTS[m])) {
        let letter = base === 'i' ? '\\i' : base === 'j' ? '\\j' : base
        for (const mark of marks) letter = `\\${ACCENTS[mark]}{${letter}}`
        out += `{${letter}}`
      }
      else out += ch
    }
  }
  return out
}

/** One name in BibTeX's "Family, Given" form, the family name braced so that hyphens and words stay whole. */
function bibtexName(displayName: string): string {
  const { family, given } = splitPersonName(displayName)
  const braced = `{${bibtexEscape(family)}}`
  return given ? `${braced}, ${bibtexEscape(given).replace(/\band\b/gi, w => `{${w}}`)}` : braced
}

export function bibtexEntry(input: CitationInput): string {
  const published = dateOf(input.publishedAt)
  const fields: Array<[string, string]> = []
  if (input.authors.length) fields.push(['author', input.authors.map(bibtexName).join(' and ')])
  fields.push(['title', bibtexEscape(titleOf(input))])
  if (published) {
    fields.push(['year', String(published.getUTCFullYear())])
    fields.push(['date', published.toISOString().slice(0, 10)])
  }
  fields.push(['publisher', 'Quillfield'])
  const version = shortVersion(input.version)
  if (version) fields.push(['version', version])
  fields.push(['url', citationUrl(input)])
  fields.push(['note', bibtexEscape(citationNote(input))])
  const width = Math.max(...fields.map(([name]) => name.length))
  const body = fields.map(([name, value]) => `  ${name.padEnd(width)} = {${value}}`).join(',\n')
  return `@misc{${citationKey(input)},\n${body}\n}\n`
}

/** Attachment file name of a download: qf-<slug>[-data-<id>].bib or .json */
export function citationFileName(input: Pick<CitationInput, 'slug' | 'dataset'>, format: 'bibtex' | 'csl-json'): string {
  const base = input.dataset ? `qf-${input.slug}-data-${input.dataset.id}` : `qf-${input.slug}`
  return format === 'bibtex' ? `${base}.bib` : `${base}.csl.json`
}
