// A live figure in a real browser: vega-embed draws the server's spec, the plate shows its status
// and convention line, and the data table is one click away.
import { mkdirSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { launchBrowser } from '../support/browser'
import { baseUrl, planeSetting, signUp, uniqueName } from '../support/http'
import { startRunner } from '../support/runner'
import type { Runner } from '../support/runner'

let browser: Browser
let page: Page
const slug = uniqueName('figure-')
const shots = 'tests/.artifacts/screenshots'

let runner: Runner

beforeAll(async () => {
  runner = await startRunner()
  mkdirSync(shots, { recursive: true })
  const author = await signUp('plotter')
  await author.client.post('/api/companions', { title: 'Figure journey', slug })
  const rows = ['x,y']
  for (let i = 0; i < 500; i++) rows.push(`${Math.sqrt((i + 0.5) / 500) * Math.cos(i * 2.399963229728653)},${Math.sqrt((i + 0.5) / 500) * Math.sin(i * 2.399963229728653)}`)
  const up = await author.client.upload<{ id: number }>(`/api/companions/${slug}/ensembles`, planeSetting('spiral'), 'spiral.csv', `${rows.join('\n')}\n`)
  const g = await author.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'g(r)', quantity: 'statistic:pair-correlation', ensembleIds: [up.body.id], parameters: { 'window-radius': 0.9, 'bins': 10, 'rmax': 0.2 } })
  for (let i = 0; i < 200; i++) {
    const c = await author.client.get<{ computation: { status: string } }>(`/api/companions/${slug}/computations/${g.body.id}`)
    if (c.body.computation.status === 'current') break
    await new Promise(resolve => setTimeout(resolve, 200))
  }
  await author.client.post(`/api/companions/${slug}/figures`, { title: 'Pair correlation of a spiral', template: 'pair-correlation', computationIds: [g.body.id], caption: 'An evenly spread spiral of 500 points.' })
  const big = ['x,y']
  for (let i = 0; i < 45_000; i++) big.push(`${Math.sqrt((i + 0.5) / 45_000) * Math.cos(i * 2.399963229728653)},${Math.sqrt((i + 0.5) / 45_000) * Math.sin(i * 2.399963229728653)}`)
  await author.client.upload(`/api/companions/${slug}/ensembles`, planeSetting('large spiral'), 'large.csv', `${big.join('\n')}\n`)
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

describe('a live figure', () => {
  it('draws the figure in the browser with its status and convention, and opens its data table', async () => {
    await page.goto(`/c/${slug}/figures/1`)
    await page.locator('html[data-ready="true"]').waitFor()
    await page.getByTestId('figure-plate-1').waitFor()
    await page.locator('[data-testid="figure-chart"] svg, [data-testid="figure-chart"] canvas').first().waitFor({ timeout: 20_000 })
    await expect(page.getByTestId('figure-status-current').count()).resolves.toBeGreaterThan(0)
    await expect(page.getByTestId('figure-convention-line').textContent()).resolves.toMatch(/engine \d+\.\d+\.\d+/)
    await page.getByTestId('figure-data-toggle').click()
    await page.getByTestId('figure-data-table').waitFor()
    await expect(page.getByTestId('figure-data-table').locator('tbody tr').count()).resolves.toBe(10)
    await page.screenshot({ path: `${shots}/figure.png`, fullPage: true })
  })

  it('shows a point\'s values when the pointer rests on it', async () => {
    const points = page.locator('[data-testid="figure-chart"] .mark-symbol path')
    await points.nth(6).hover()
    const tooltip = page.locator('#vg-tooltip-element.visible')
    await tooltip.waitFor({ timeout: 10_000 })
    await expect(tooltip.textContent()).resolves.toMatch(/g/)
    await expect(tooltip.textContent()).resolves.toMatch(/\d\.\d/)
  })

  it('watches a progress bar complete while a long computation runs', async () => {
    await page.goto(`/c/${slug}/computations`)
    await page.locator('html[data-ready="true"]').waitFor()
    const id = await page.evaluate(async (s) => {
      const list = await (await fetch(`/api/companions/${s}/ensembles`)).json() as { ensembles: Array<{ id: number, name: string }> }
      const large = list.ensembles.find(e => e.name === 'large spiral')!
      const made = await fetch(`/api/companions/${s}/computations`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: 'long energy', quantity: 'energy', ensembleIds: [large.id], parameters: {} }) })
      return ((await made.json()) as { id: number }).id
    }, slug)
    await page.reload()
    await page.locator('html[data-ready="true"]').waitFor()
    const bar = page.getByTestId(`computation-progress-${id}`)
    await bar.waitFor({ timeout: 10_000 })
    await page.screenshot({ path: `${shots}/computation-progress.png` })
    await bar.waitFor({ state: 'detached', timeout: 90_000 })
    await page.reload()
    await expect(page.getByTestId('computation-list').textContent()).resolves.toMatch(/long energy[\s\S]*current/)
  }, 120_000)
})
