// Uploading an ensemble in a real browser: the progress bar shows while the file is sent, then the
// preview of the first configuration; a bad file shows the engine's complaint with its line.
import { mkdirSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { launchBrowser } from '../support/browser'
import { baseUrl, signUp, uniqueName } from '../support/http'

let browser: Browser
let page: Page
const shots = 'tests/.artifacts/screenshots'
const slug = uniqueName('upload-')

beforeAll(async () => {
  mkdirSync(shots, { recursive: true })
  browser = await launchBrowser()
  const author = await signUp('uploader')
  await author.client.post('/api/companions', { title: 'Upload journey', slug })
  const context = await browser.newContext({ baseURL: baseUrl })
  const [name, value] = author.client.cookie.split('=')
  await context.addCookies([{ name: name!, value: value!, url: baseUrl }])
  page = await context.newPage()
})

afterAll(async () => {
  await browser?.close()
})

function csvOf(points: number): string {
  const rows = ['x,y']
  for (let i = 0; i < points; i++) {
    const r = Math.sqrt((i + 0.5) / points)
    const t = i * 2.399963229728653 // the golden angle: a spiral that fills the disk evenly
    rows.push(`${(r * Math.cos(t)).toPrecision(17)},${(r * Math.sin(t)).toPrecision(17)}`)
  }
  return `${rows.join('\n')}\n`
}

describe('upload journey', () => {
  it('uploads a file with the progress bar visible and sees the preview', async () => {
    await page.goto(`/c/${slug}/data`)
    await page.locator('html[data-ready="true"]').waitFor()
    await page.getByTestId('upload-toggle').click()
    // Slow the request down so the progress bar can be seen while the bytes are sent.
    const session = await page.context().newCDPSession(page)
    await session.send('Network.enable')
    await session.send('Network.emulateNetworkConditions', { offline: false, latency: 20, downloadThroughput: -1, uploadThroughput: 400 * 1024 })
    await page.getByTestId('upload-file').setInputFiles({ name: 'spiral.csv', mimeType: 'text/csv', buffer: Buffer.from(csvOf(30000)) })
    await page.getByLabel('Name of the ensemble').fill('Golden spiral, N = 30000')
    await page.getByTestId('upload-submit').click()
    await page.getByTestId('upload-progress').waitFor({ state: 'attached' })
    await page.screenshot({ path: `${shots}/upload-progress.png` })
    await page.getByTestId('upload-stored').waitFor({ timeout: 60_000 })
    await session.send('Network.emulateNetworkConditions', { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 })
    await expect(page.getByTestId('ensemble-preview').locator('circle').count()).resolves.toBe(2000)
    await page.screenshot({ path: `${shots}/upload-stored.png`, fullPage: true })
    await expect(page.getByTestId('ensemble-table').textContent()).resolves.toContain('Golden spiral, N = 30000')
  })

  it('shows where a bad file goes wrong', async () => {
    await page.getByTestId('upload-file').setInputFiles({ name: 'broken.csv', mimeType: 'text/csv', buffer: Buffer.from('x,y\n0.1,0.2\n0.3\n') })
    await page.getByLabel('Name of the ensemble').fill('Broken')
    await page.getByTestId('upload-submit').click()
    await page.getByTestId('upload-error').waitFor()
    const text = await page.getByTestId('upload-error').textContent()
    expect(text).toContain('broken.csv')
    expect(text).toMatch(/line 3/)
    await page.screenshot({ path: `${shots}/upload-error.png`, fullPage: true })
  })

  it('opens the ensemble page with its configuration table and convention', async () => {
    await page.goto(`/c/${slug}/data`)
    await page.getByRole('link', { name: 'Golden spiral, N = 30000' }).click()
    await page.getByTestId('ensemble-name').waitFor()
    await expect(page.getByTestId('configuration-table').textContent()).resolves.toContain('30000')
    await expect(page.getByTestId('ensemble-convention').textContent()).resolves.toContain('Σ_{i≠j} −log|x_i−x_j| + N Σ V(x_i)')
    await page.screenshot({ path: `${shots}/ensemble.png`, fullPage: true })
  })
})
