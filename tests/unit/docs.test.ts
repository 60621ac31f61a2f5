// The documentation covers the engine: a method page for every quantity of the catalogue, with a
// formula that KaTeX can set and a Sources section, and a command-line reference naming every
// command and option. Pages are read from content/ as the site builds them.
import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join } from 'node:path'
import katex from 'katex'
import { describe, expect, it } from 'vitest'
import { catalogue } from '../../cli/catalogue'
import { commands } from '../../cli/commands'

const root = join(process.cwd(), 'content')

function markdownFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name)
    return statSync(path).isDirectory() ? markdownFiles(path) : name.endsWith('.md') ? [path] : []
  })
}

interface Page { path: string, quantity?: string, title?: string, body: string }

function readPage(path: string): Page {
  const text = readFileSync(path, 'utf8')
  const match = /^---\n([\s\S]*?)\n---\n([\s\S]*)$/.exec(text)
  if (!match) return { path, body: text }
  const front = Object.fromEntries(match[1]!.split('\n').map(line => line.split(/:\s(.*)/s)).filter(p => p.length >= 2).map(([k, v]) => [k!.trim(), v!.trim()]))
  return { path, quantity: front.quantity, title: front.title, body: match[2]! }
}

const methodPages = markdownFiles(join(root, 'methods')).map(readPage)

/** Math segments as remark-math reads them: $$…$$ blocks and $…$ inline (outside code). */
function mathOf(body: string): { display: string[], inline: string[] } {
  const withoutCode = body.replace(/```[\s\S]*?```/g, '').replace(/`[^`\n]*`/g, '')
  const display = [...withoutCode.matchAll(/\$\$([\s\S]+?)\$\$/g)].map(m => m[1]!)
  const rest = withoutCode.replace(/\$\$[\s\S]+?\$\$/g, '')
  const inline = [...rest.matchAll(/\$([^$\n]+?)\$/g)].map(m => m[1]!)
  return { display, inline }
}

describe('method pages', () => {
  for (const quantity of catalogue) {
    it(`${quantity.id} has a page with a formula and its sources`, () => {
      const pages = methodPages.filter(p => p.quantity === quantity.id)
      expect(pages.map(p => p.path)).toHaveLength(1)
      const page = pages[0]!
      expect(page.title).toBeTruthy()
      expect(mathOf(page.body).display.length).toBeGreaterThan(0)
      expect(page.body).toMatch(/^## Convention$/m)
      const sources = /^## Sources\n+((?:- .+\n?)+)/m.exec(page.body)
      expect(sources, 'a Sources section with a list of references').not.toBeNull()
      // A full reference names a year (common practice for citations).
      for (const line of sources![1]!.trim().split('\n')) expect(line).toMatch(/\b(1[89]|20)\d\d\b/)
    })
  }

  it('names no quantity that the catalogue lacks', () => {
    const ids = new Set(catalogue.map(q => q.id))
    for (const page of methodPages.filter(p => p.quantity)) expect(ids.has(page.quantity!), page.path).toBe(true)
  })

  it('has math that KaTeX sets without an error', () => {
    for (const page of methodPages) {
      const { display, inline } = mathOf(page.body)
      for (const tex of display) expect(() => katex.renderToString(tex, { displayMode: true, throwOnError: true }), `${page.path}: ${tex}`).not.toThrow()
      for (const tex of inline) expect(() => katex.renderToString(tex, { throwOnError: true }), `${page.path}: ${tex}`).not.toThrow()
    }
  })
})

describe('command-line reference', () => {
  const reference = readFileSync(join(root, 'guide', 'command-line.md'), 'utf8')

  for (const command of commands) {
    it(`documents ${command.name} and each of its options`, () => {
      expect(reference).toMatch(new RegExp(`^## ${command.name}$`, 'm'))
      const section = reference.split(new RegExp(`^## ${command.name}$`, 'm'))[1]!.split(/^## /m)[0]!
      expect(section).toContain(`npm run --silent engine -- ${command.name}`)
      for (const option of command.options) expect(section, `--${option.name}`).toContain(`\`--${option.name}\``)
    })
  }
})

describe('guide', () => {
  it('has a page for each role', () => {
    const titles = markdownFiles(join(root, 'guide')).map(readPage).map(p => p.title)
    for (const role of ['editors', 'authors', 'reviewers', 'readers']) expect(titles).toContain(`For ${role}`)
  })
})
