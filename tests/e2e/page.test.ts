// Writing the companion page in a real browser: math set by KaTeX in the live preview, a live
// figure placed by a directive, and both on the companion page after saving.
import { mkdirSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { launchBrowser } from '../support/browser'
import { baseUrl, planeSetting, signUp, uniqueName } from '../support/http'
import { startRunner } from '../support/runner'
import type { Runner } from '../support/runner'

let browser: Browser
let page: Page
let runner: Runner
const slug = uniqueName('page-e2e-')
const shots = 'tests/.artifacts/screenshots'

beforeAll(async () => {
  runner = await startRunner()
  mkdirSync(shots, { recursive: true })
  const author = await signUp('page-writer')
  await author.client.post('/api/companions', { title: 'A page with math', slug })
  const rows = ['x,y']
  for (let i = 0; i < 300; i++) rows.push(`${Math.sqrt((i + 0.5) / 300) * Math.cos(i * 2.399963229728653)},${Math.sqrt((i + 0.5) / 300) * Math.sin(i * 2.399963229728653)}`)
  const up = await author.client.upload<{ id: number }>(`/api/companions/${slug}/ensembles`, planeSetting('spiral'), 'spiral.csv', `${rows.join('\n')}\n`)
  const g = await author.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'g(r)', quantity: 'statistic:pair-correlation', ensembleIds: [up.body.id], parameters: { 'window-radius': 0.9, 'bins': 8, 'rmax': 0.2 } })
  for (let i = 0; i < 200; i++) {
    const c = await author.client.get<{ computation: { status: string } }>(`/api/companions/${slug}/computations/${g.body.id}`)
    if (c.body.computation.status === 'current') break
    await new Promise(resolve => setTimeout(resolve, 200))
  }
  const figure = await author.client.post(`/api/companions/${slug}/figures`, { title: 'Pair correlation of a spiral', template: 'pair-correlation', computationIds: [g.body.id] })
  expect(figure.status).toBe(201)
  browser = await launchBrowser()
  const context = await browser.newContext({ baseURL: baseUrl })
  const [name, value] = author.client.cookie.split('=')
  await context.addCookies([{ name: name!, value: value!, url: baseUrl }])
  page = await context.newPage()
})

afterAll(async () => {
  await runner?.stop()
  await browser?.close()
})

describe('writing the companion page', () => {
  it('previews math with KaTeX, saves a revision, and shows the math and the live figure on the page', async () => {
    await page.goto(`/c/${slug}`)
    await page.locator('html[data-ready="true"]').waitFor()
    await page.getByTestId('page-empty').waitFor()
    await page.getByTestId('write-page-link').click()
    await page.waitForURL(`**/c/${slug}/write`)
    await page.locator('html[data-ready="true"]').waitFor()

    const text = [
      '## The log-gas energy',
      '',
      'We compute $H_N = -\\sum_{i<j} \\log|x_i - x_j| + N \\sum_{i=1}^{N} V(x_i)$ for each configuration.',
      '',
      '',
    ].join('\n')
    await page.getByTestId('page-text').fill(text)
    await page.getByTestId('insert-figure-1').click()
    await expect(page.getByTestId('page-text').inputValue()).resolves.toContain('@figure 1')
    await page.getByTestId('page-preview').locator('.katex').first().waitFor()
    await page.getByTestId('page-preview').getByTestId('figure-plate-1').waitFor()
    await expect(page.getByTestId('page-preview').locator('h2').textContent()).resolves.toBe('The log-gas energy')

    await page.getByTestId('page-message').fill('Introduce the energy')
    await page.getByTestId('page-save').click()
    await page.getByTestId('page-revision').waitFor()
    await expect(page.getByTestId('form-message').textContent()).resolves.toMatch(/Saved as revision [0-9a-f]{7}/)
    await page.screenshot({ path: `${shots}/page-write.png`, fullPage: true })

    await page.goto(`/c/${slug}`)
    await page.locator('html[data-ready="true"]').waitFor()
    const shown = page.getByTestId('companion-page')
    await shown.locator('.katex').first().waitFor()
    await expect(shown.locator('.katex-mathml annotation').first().textContent()).resolves.toContain('\\log|x_i - x_j|')
    await shown.getByTestId('figure-plate-1').waitFor()
    await shown.locator('[data-testid="figure-chart"] svg, [data-testid="figure-chart"] canvas').first().waitFor({ timeout: 20_000 })
    await page.screenshot({ path: `${shots}/page.png`, fullPage: true })
  })
})
