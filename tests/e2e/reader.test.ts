// An anonymous reader finds a published companion by an author's name on the front page, opens its
// cite page and downloads the BibTeX, which a reference parser (@citation-js/plugin-bibtex) reads back.
import { mkdirSync, readFileSync } from 'node:fs'
import { Cite } from '@citation-js/core'
import '@citation-js/plugin-bibtex'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { launchBrowser } from '../support/browser'
import { baseUrl, signUp, uniqueName, withDatabase } from '../support/http'

let browser: Browser
let page: Page
const shots = 'tests/.artifacts/screenshots'
const slug = uniqueName('reader-e2e-')
const family = `Quillanby${uniqueName('').replace(/[^a-z0-9]/gi, '')}`
const title = 'Hexatic order of an invented plasma & its 50% edge'

beforeAll(async () => {
  mkdirSync(shots, { recursive: true })
  browser = await launchBrowser()
  const editor = await signUp('reader-e2e-editor')
  const author = await signUp('reader-e2e-author')
  await author.client.patch('/api/account', { displayName: `Zoë ${family}`, affiliation: '', orcid: '' })
  await editor.client.post('/api/companions', { title, slug, abstract: 'Invented for a browser test.', manuscriptRef: 'E2E-1' })
  await editor.client.post(`/api/companions/${slug}/members`, { email: author.email, role: 'author' })
  // The state-change route belongs to the review workflow; here the state is set directly.
  await withDatabase(c => c.query('UPDATE companion SET state = ?, published_at = ? WHERE slug = ?', ['published', new Date('2026-09-14T08:00:00Z'), slug]))
  const context = await browser.newContext({ baseURL: baseUrl, acceptDownloads: true })
  page = await context.newPage()
})

afterAll(async () => {
  await browser?.close()
})

describe('reader journey', () => {
  it('searches the front page, opens the cite page and downloads the BibTeX', async () => {
    await page.goto('/')
    await page.locator('html[data-ready="true"]').waitFor()
    await page.getByTestId('published-search').fill(family)
    // The list is filtered once the search has been sent (after a short pause in typing).
    await page.getByTestId('published-count').filter({ hasText: `matching “${family}”` }).waitFor()
    const item = page.getByTestId(`published-${slug}`)
    await expect(page.getByTestId('published-list').locator('li').count()).resolves.toBe(1)
    await expect(item.textContent()).resolves.toContain(`Zoë ${family}`)
    await page.screenshot({ path: `${shots}/reader-search.png`, fullPage: true })

    await item.getByRole('link', { name: 'Cite' }).click()
    await page.getByTestId('cite-heading').waitFor()
    await page.locator('html[data-ready="true"]').waitFor()
    await expect(page.getByTestId('cite-engine').textContent()).resolves.toMatch(/engine \d+\.\d+\.\d+/)
    await expect(page.getByTestId('reader-license').textContent()).resolves.toContain('CC-BY-4.0')
    await page.screenshot({ path: `${shots}/reader-cite.png`, fullPage: true })

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByTestId('citation-companion-bibtex').click(),
    ])
    expect(download.suggestedFilename()).toBe(`qf-${slug}.bib`)
    const text = readFileSync((await download.path())!, 'utf8')
    const [entry] = new Cite(text).data as Array<{ title: string, author: Array<{ family: string, given: string }>, issued: { 'date-parts': number[][] } }>
    expect(entry!.title).toBe(title)
    expect(entry!.author).toEqual([{ family, given: 'Zoë' }])
    expect(entry!.issued['date-parts'][0]![0]).toBe(2026)
  })

  it('reads a method page with its formulas set by KaTeX, and the command-line reference', async () => {
    await page.goto('/methods')
    await page.locator('html[data-ready="true"]').waitFor()
    await page.getByTestId('methods-list').getByRole('link', { name: 'Pair correlation g(r)' }).click()
    const article = page.getByTestId('method-page')
    await article.waitFor()
    await expect(article.locator('.katex-display').count()).resolves.toBeGreaterThan(1)
    await expect(article.textContent()).resolves.not.toContain('$$')
    await expect(article.getByRole('heading', { name: 'Sources' }).count()).resolves.toBe(1)
    await page.screenshot({ path: `${shots}/reader-method.png`, fullPage: true })
    await page.goto('/guide/command-line')
    await page.locator('html[data-ready="true"]').waitFor()
    await expect(page.getByTestId('guide-page').getByRole('heading', { name: 'verify', exact: true }).count()).resolves.toBe(1)
    await expect(page.getByTestId('guide-page').locator('table').count()).resolves.toBeGreaterThan(9)
    await page.screenshot({ path: `${shots}/reader-cli.png`, fullPage: true })
  })
})
