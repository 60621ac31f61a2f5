// A live figure in a real browser: vega-embed draws the server's spec, the plate shows its status
// and convention line, and the data table is one click away.
import { mkdirSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { launchBrowser } from '../support/browser'
import { baseUrl, planeSetting, signUp, uniqueName } from '../support/http'

let browser: Browser
let page: Page
const slug = uniqueName('figure-')
const shots = 'tests/.artifacts/screenshots'

beforeAll(async () => {
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
  browser = await launchBrowser()
  const context = await browser.newContext({ baseURL: baseUrl })
  const [name, value] = author.client.cookie.split('=')
  await context.addCookies([{ name: name!, value: value!, url: baseUrl }])
  page = await context.newPage()
})

afterAll(async () => {
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
})
