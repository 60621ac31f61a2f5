// Remarks in a real browser: a reviewer picks a point on the live chart, writes the remark and
// sees its pin drawn on the figure; the author sees the thread as "Reviewer 1" and replies.
import { mkdirSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { launchBrowser } from '../support/browser'
import { baseUrl, planeSetting, signUp, uniqueName, withDatabase } from '../support/http'
import type { TestAccount } from '../support/http'
import { startRunner } from '../support/runner'
import type { Runner } from '../support/runner'

let browser: Browser
let runner: Runner
let editor: TestAccount
let author: TestAccount
let reviewer: TestAccount
const slug = uniqueName('remark-e2e-')
const reviewerName = `Odile Brantwood ${Date.now().toString(36)}`
const shots = 'tests/.artifacts/screenshots'

async function pageAs(account: TestAccount): Promise<{ context: BrowserContext, page: Page }> {
  const context = await browser.newContext({ baseURL: baseUrl })
  const [name, value] = account.client.cookie.split('=')
  await context.addCookies([{ name: name!, value: value!, url: baseUrl }])
  return { context, page: await context.newPage() }
}

beforeAll(async () => {
  runner = await startRunner()
  mkdirSync(shots, { recursive: true })
  editor = await signUp('remark-e2e-editor')
  author = await signUp('remark-e2e-author')
  reviewer = await signUp('remark-e2e-reviewer')
  await reviewer.client.patch('/api/account', { displayName: reviewerName, affiliation: '', orcid: '' })
  // The maker of a companion is its editor; the author and the reviewer are added by them.
  await editor.client.post('/api/companions', { title: 'Remarks in the browser', slug })
  await editor.client.post(`/api/companions/${slug}/members`, { email: author.email, role: 'author' })
  await editor.client.post(`/api/companions/${slug}/members`, { email: reviewer.email, role: 'reviewer' })
  const rows = ['x,y']
  for (let i = 0; i < 400; i++) rows.push(`${Math.sqrt((i + 0.5) / 400) * Math.cos(i * 2.399963229728653)},${Math.sqrt((i + 0.5) / 400) * Math.sin(i * 2.399963229728653)}`)
  const up = await editor.client.upload<{ id: number }>(`/api/companions/${slug}/ensembles`, planeSetting('spiral'), 'spiral.csv', `${rows.join('\n')}\n`)
  const g = await editor.client.post<{ id: number }>(`/api/companions/${slug}/computations`, { name: 'g(r)', quantity: 'statistic:pair-correlation', ensembleIds: [up.body.id], parameters: { 'window-radius': 0.9, 'bins': 8, 'rmax': 0.2 } })
  for (let i = 0; i < 200; i++) {
    const c = await editor.client.get<{ computation: { status: string } }>(`/api/companions/${slug}/computations/${g.body.id}`)
    if (c.body.computation.status === 'current') break
    await new Promise(resolve => setTimeout(resolve, 200))
  }
  await editor.client.post(`/api/companions/${slug}/figures`, { title: 'Pair correlation of a spiral', template: 'pair-correlation', computationIds: [g.body.id] })
  browser = await launchBrowser()
})

afterAll(async () => {
  await runner?.stop()
  await browser?.close()
})

describe('remarks on a live figure', () => {
  it('lets a reviewer pick a point on the chart, write a remark, and see its pin', async () => {
    const { context, page } = await pageAs(reviewer)
    await page.goto(`/c/${slug}/figures/1`)
    await page.locator('html[data-ready="true"]').waitFor()
    await page.locator('[data-testid="figure-chart"][data-live="yes"]').waitFor({ timeout: 20_000 })
    await page.getByLabel('Pick a point').check()
    await page.locator('[data-testid="figure-chart"][data-pick="point"]').waitFor()
    await page.locator('[data-testid="figure-chart"] .mark-symbol path').nth(3).click()
    const draft = page.getByTestId('remark-draft-anchor')
    await draft.waitFor()
    await expect(draft.textContent()).resolves.toMatch(/Pinned at r = \d[\d.e-]*, g = \d[\d.e-]*/)
    await page.getByLabel('Your remark').fill('This shell sits above the β = 2 reference; is the bin too narrow?')
    await page.getByRole('button', { name: 'Post the remark' }).click()
    const thread = page.getByTestId('remark-thread').first()
    await thread.waitFor()
    await expect(thread.textContent()).resolves.toContain('is the bin too narrow?')
    await expect(thread.getByTestId('remark-anchor').textContent()).resolves.toMatch(/Pinned at r = \d/)
    await expect(thread.getByTestId('remark-writer').first().textContent()).resolves.toContain(reviewerName)
    // The pin: the chart is drawn again with one diamond in the pins' layer.
    await page.locator('[data-testid="figure-chart"][data-pins="1"][data-live="yes"]').waitFor()
    await page.locator('[data-testid="figure-chart"] .remarkpins_marks path').first().waitFor({ timeout: 10_000 })
    await expect(page.locator('[data-testid="figure-chart"] .remarkpins_marks path').count()).resolves.toBe(1)
    await page.screenshot({ path: `${shots}/remark-pin.png`, fullPage: true })
    await context.close()
  })

  it('lets a reviewer mark a region by dragging a rectangle on the chart', async () => {
    const { context, page } = await pageAs(reviewer)
    await page.goto(`/c/${slug}/figures/1`)
    await page.locator('html[data-ready="true"]').waitFor()
    await page.locator('[data-testid="figure-chart"][data-live="yes"]').waitFor({ timeout: 20_000 })
    await page.getByLabel('Mark a region').check()
    const picker = page.getByTestId('figure-region-picker')
    await picker.waitFor()
    const plot = (await page.locator('[data-testid="figure-chart"] .mark-group.role-frame path').first().boundingBox())!
    await page.mouse.move(plot.x + plot.width * 0.3, plot.y + plot.height * 0.7)
    await page.mouse.down()
    await page.mouse.move(plot.x + plot.width * 0.5, plot.y + plot.height * 0.5, { steps: 5 })
    await page.mouse.move(plot.x + plot.width * 0.6, plot.y + plot.height * 0.3, { steps: 5 })
    await page.mouse.up()
    const draft = page.getByTestId('remark-draft-anchor')
    await draft.waitFor()
    const text = (await draft.textContent())!
    // The corners, read back in data coordinates: r from about 30 % to 60 % of the axis, g from 30 % to 70 % of its height.
    const m = /region r from ([\d.e-]+) to ([\d.e-]+), g from ([\d.e-]+) to ([\d.e-]+)/.exec(text)
    expect(m).not.toBeNull()
    const [x0, x1, y0, y1] = m!.slice(1).map(Number) as [number, number, number, number]
    expect(x0).toBeLessThan(x1)
    expect(y0).toBeLessThan(y1)
    await page.getByLabel('Your remark').fill('The three shells in this box drift together.')
    await page.getByRole('button', { name: 'Post the remark' }).click()
    await page.getByText('The three shells in this box drift together.').waitFor()
    await page.locator('[data-testid="figure-chart"] .remarkpinsregion_marks path').first().waitFor({ timeout: 10_000 })
    await context.close()
  })

  it('shows the author the thread as "Reviewer 1", and takes the author\'s reply', async () => {
    const { context, page } = await pageAs(author)
    await page.goto(`/c/${slug}/figures/1`)
    await page.locator('html[data-ready="true"]').waitFor()
    const thread = page.getByTestId('remark-thread').filter({ hasText: 'is the bin too narrow?' })
    await thread.waitFor()
    await expect(thread.getByTestId('remark-writer').first().textContent()).resolves.toBe('Reviewer 1')
    await expect(page.locator('body').textContent()).resolves.not.toContain(reviewerName)
    const id = await thread.getAttribute('data-remark-id')
    await page.getByLabel(`Reply to remark ${id}`).fill('We will double the bin width in the next revision.')
    await thread.getByRole('button', { name: 'Send the reply' }).click()
    await expect.poll(() => thread.getByTestId('remark-message').count(), { timeout: 10_000 }).toBe(2)
    await expect(thread.getByTestId('remark-writer').nth(1).textContent()).resolves.toContain('(you)')
    await thread.getByRole('button', { name: 'Settle the remark' }).click()
    await thread.getByTestId('remark-state-settled').waitFor()
    // The companion's list of remarks links back to the figure.
    await page.goto(`/c/${slug}/remarks`)
    await page.locator('html[data-ready="true"]').waitFor()
    await page.getByRole('link', { name: 'Figure 1' }).first().waitFor()
    await expect(page.getByTestId('remark-thread').count()).resolves.toBe(2)
    await page.getByLabel('State').selectOption('settled')
    await expect.poll(() => page.getByTestId('remark-thread').count(), { timeout: 10_000 }).toBe(1)
    await expect(page.getByTestId('remark-thread').textContent()).resolves.toContain('is the bin too narrow?')
    await context.close()
  })
})

describe('remark e-mail choices', () => {
  it('sets the remark e-mail preference on the account page', async () => {
    const { context, page } = await pageAs(author)
    await page.goto('/account')
    await page.locator('html[data-ready="true"]').waitFor()
    await expect(page.getByLabel('Each at once').isChecked()).resolves.toBe(true)
    await page.getByLabel('A daily digest').check()
    await page.getByTestId('profile-submit').click()
    await page.getByText('Your profile is saved.').waitFor()
    expect((await author.client.get<{ account: { remarkMail: string } }>('/api/account')).body.account.remarkMail).toBe('daily')
    await context.close()
  })

  it('turns remark e-mail off from the digest\'s link without signing in, and says when a link is unknown', async () => {
    const key = `e2e-key-${Date.now().toString(36)}`
    await withDatabase(c => c.query('UPDATE user SET mail_key = ? WHERE id = ?', [key, author.id]))
    const context = await browser.newContext({ baseURL: baseUrl })
    const page = await context.newPage()
    await page.goto(`/mail/stop?key=${key}x`)
    await page.locator('[data-testid="mail-stop"][data-outcome="unknown"]').waitFor()
    await page.goto(`/mail/stop?key=${key}`)
    await page.locator('[data-testid="mail-stop"][data-outcome="stopped"]').waitFor()
    await page.getByRole('link', { name: 'your account page' }).waitFor()
    expect((await author.client.get<{ account: { remarkMail: string } }>('/api/account')).body.account.remarkMail).toBe('none')
    await context.close()
  })
})
