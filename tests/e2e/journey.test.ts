// The whole journey of a companion in a real browser: an editor opens it and invites an author
// and a reviewer by e-mail; the author uploads, computes, draws, writes the page and submits; the
// reviewer pins a remark to a point of the figure; the author is told, answers and uploads a
// corrected ensemble; the figure recomputes; the editor accepts and publishes; an anonymous reader
// opens the page and downloads the data. All along, nothing the author's browser receives names
// the reviewer.
import { mkdirSync, readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { launchBrowser } from '../support/browser'
import { baseUrl, signUp, uniqueName } from '../support/http'
import type { TestAccount } from '../support/http'
import { linkIn, mailTo, waitForMail } from '../support/mail'
import { startRunner } from '../support/runner'
import type { Runner } from '../support/runner'

const shots = 'tests/.artifacts/screenshots/journey'
const slug = uniqueName('journey-')
const title = 'Next-order energy of a two-dimensional plasma at β = 2'
const authorAddress = `${uniqueName('ada.quill')}@harbour.example`
const reviewerAddress = `${uniqueName('referee')}@elsewhere.example`
const reviewerName = `Referee ${uniqueName('R')}`
const password = 'a long enough password'

let runner: Runner
let browser: Browser
let editor: TestAccount
const contexts: BrowserContext[] = []
let editorPage: Page
let authorPage: Page
let reviewerPage: Page
/** Every response body the author's browser received (pages and API), to look for the reviewer. */
const seenByAuthor: string[] = []
let ensembleId = 0

/** A spiral of n points filling the unit disk evenly (golden angle). */
function spiral(n: number, twist = 2.399963229728653): string {
  const rows = ['x,y']
  for (let i = 0; i < n; i++) rows.push(`${Math.sqrt((i + 0.5) / n) * Math.cos(i * twist)},${Math.sqrt((i + 0.5) / n) * Math.sin(i * twist)}`)
  return `${rows.join('\n')}\n`
}

async function newPage(account?: TestAccount): Promise<Page> {
  const context = await browser.newContext({ baseURL: baseUrl, acceptDownloads: true })
  contexts.push(context)
  if (account) {
    const [name, value] = account.client.cookie.split('=')
    await context.addCookies([{ name: name!, value: value!, url: baseUrl }])
  }
  return context.newPage()
}

async function open(page: Page, path: string) {
  await page.goto(path)
  await page.locator('html[data-ready="true"]').waitFor()
}

/** Polls the API from the page until the figure's computations are current. */
async function waitForFigureStatus(page: Page, number: number, status: string) {
  await expect.poll(async () => page.evaluate(async ([s, n]) => {
    const reply = await fetch(`/api/companions/${s}/figures/${n}`)
    return ((await reply.json()) as { status?: { word?: string } }).status?.word ?? ''
  }, [slug, number] as const), { timeout: 60_000, interval: 300 }).toBe(status)
}

/** Signs up on the invitation page's way and accepts; returns on the companion page. */
async function acceptInvitation(page: Page, link: string, address: string, name: string) {
  await open(page, new URL(link).pathname)
  await page.getByTestId('invitation-sign-up').click()
  await page.getByLabel('Your name').fill(name)
  await expect(page.getByLabel('E-mail address').inputValue()).resolves.toBe(address)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Make the account' }).click()
  await page.getByTestId('invitation-accept').click()
  await page.waitForURL(`**/c/${slug}`)
}

beforeAll(async () => {
  runner = await startRunner()
  mkdirSync(shots, { recursive: true })
  browser = await launchBrowser()
  editor = await signUp('journey-editor')
})

afterAll(async () => {
  for (const context of contexts) await context.close().catch(() => undefined)
  await browser?.close()
  await runner?.stop()
})

describe('the journey of a companion', () => {
  it('an editor opens a companion and invites an author and a reviewer by e-mail', async () => {
    editorPage = await newPage(editor)
    await open(editorPage, '/desk')
    await editorPage.getByTestId('companion-create-toggle').click()
    await editorPage.getByLabel('Manuscript title').fill(title)
    await editorPage.getByLabel('Short name (in the address)').fill(slug)
    await editorPage.getByTestId('companion-create-submit').click()
    await editorPage.waitForURL(`**/c/${slug}`)
    await open(editorPage, `/c/${slug}/people`)
    for (const [address, role] of [[authorAddress, 'author'], [reviewerAddress, 'reviewer']] as const) {
      await editorPage.getByTestId('field-inviteEmail').fill(address)
      await editorPage.locator('#invite-role').selectOption(role)
      await editorPage.getByTestId('invite-submit').click()
      await editorPage.getByText(`The invitation is on its way to ${address}.`).waitFor()
    }
    await expect(editorPage.getByTestId('invitation-table').textContent()).resolves.toContain(reviewerAddress)
    await editorPage.screenshot({ path: `${shots}/01-invitations.png`, fullPage: true })
  }, 120_000)

  it('the invitations arrive and their links work: the author follows hers from the development inbox', async () => {
    authorPage = await newPage()
    authorPage.on('response', async (response) => {
      if (!response.url().startsWith(baseUrl)) return
      const type = response.headers()['content-type'] ?? ''
      if (/json|html|text/.test(type)) seenByAuthor.push(await response.text().catch(() => ''))
    })
    await waitForMail(authorAddress, /Invitation/)
    await open(authorPage, `/dev/inbox?to=${encodeURIComponent(authorAddress)}`)
    await authorPage.getByRole('button', { name: /Invitation: author/ }).first().click()
    const link = await authorPage.getByTestId('inbox-message').getByRole('link', { name: /\/invitations\// }).getAttribute('href')
    expect(link).toContain('/invitations/')
    await acceptInvitation(authorPage, link!, authorAddress, 'Ada Quill')

    reviewerPage = await newPage()
    const invitation = await waitForMail(reviewerAddress, /Invitation: reviewer/)
    expect(invitation.text).toContain(title)
    await acceptInvitation(reviewerPage, linkIn(invitation, '/invitations/'), reviewerAddress, reviewerName)
  }, 120_000)

  it('the author uploads an ensemble, attaches a computation and draws a figure', async () => {
    await open(authorPage, `/c/${slug}/data`)
    await authorPage.getByTestId('upload-toggle').click()
    await authorPage.getByTestId('upload-file').setInputFiles({ name: 'spiral.csv', mimeType: 'text/csv', buffer: Buffer.from(spiral(400)) })
    await authorPage.getByLabel('Name of the ensemble').fill('Spiral, N = 400')
    await authorPage.getByTestId('upload-submit').click()
    await authorPage.getByTestId('upload-stored').waitFor({ timeout: 60_000 })
    ensembleId = await authorPage.evaluate(async (s) => {
      const list = await (await fetch(`/api/companions/${s}/ensembles`)).json() as { ensembles: Array<{ id: number }> }
      return list.ensembles[0]!.id
    }, slug)

    await open(authorPage, `/c/${slug}/computations`)
    await authorPage.getByTestId('computation-quantity').selectOption('statistic:pair-correlation')
    await authorPage.getByTestId('param-window-radius').fill('0.9')
    await authorPage.getByTestId('param-bins').fill('8')
    await authorPage.getByTestId('param-rmax').fill('0.2')
    await authorPage.getByTestId('computation-submit').click()
    await authorPage.getByTestId('computation-list').waitFor()

    await open(authorPage, `/c/${slug}/figures`)
    await authorPage.getByTestId('figure-template').selectOption('pair-correlation')
    await authorPage.getByLabel('Title').fill('Pair correlation of the spiral')
    await authorPage.getByTestId('figure-submit').click()
    await authorPage.waitForURL(`**/c/${slug}/figures/1`)
    await waitForFigureStatus(authorPage, 1, 'current')
  }, 120_000)

  it('the author writes the page with math and the live figure, and submits it for review', async () => {
    await open(authorPage, `/c/${slug}/write`)
    await authorPage.getByTestId('page-text').fill([
      '## The question',
      '',
      'For the two-dimensional plasma with $V(x) = |x|^2$ we test whether the energy',
      '',
      '$$',
      'H_N = -\\sum_{i \\ne j} \\log|x_i - x_j| + N \\sum_{i=1}^{N} V(x_i)',
      '$$',
      '',
      'has the next-order term the manuscript states. The pair correlation of one configuration:',
      '',
      '',
    ].join('\n'))
    await authorPage.getByTestId('insert-figure-1').click()
    await authorPage.getByTestId('page-preview').locator('.katex-display').first().waitFor()
    await authorPage.getByTestId('page-message').fill('The question and the first figure')
    await authorPage.getByTestId('page-save').click()
    await authorPage.getByTestId('page-revision').waitFor()

    await open(authorPage, `/c/${slug}/course`)
    await authorPage.getByLabel(/Submit for review/).check()
    await authorPage.getByLabel('Reason').fill('The data and the page are ready for the referees.')
    await authorPage.getByTestId('course-move-submit').click()
    await authorPage.getByText('Now in review.', { exact: false }).waitFor()
    await authorPage.screenshot({ path: `${shots}/03-submitted.png`, fullPage: true })
    const told = await waitForMail(reviewerAddress, /now in review/)
    expect(told.text).toContain('The data and the page are ready for the referees.')
  }, 120_000)

  it('the reviewer pins a remark to a point of the figure', async () => {
    await open(reviewerPage, `/c/${slug}/figures/1`)
    await reviewerPage.locator('[data-testid="figure-chart"][data-live="yes"]').waitFor({ timeout: 20_000 })
    await reviewerPage.getByLabel('Pick a point').check()
    await reviewerPage.locator('[data-testid="figure-chart"][data-pick="point"]').waitFor()
    await reviewerPage.locator('[data-testid="figure-chart"] .mark-symbol path').nth(2).click()
    await expect(reviewerPage.getByTestId('remark-draft-anchor').textContent()).resolves.toMatch(/Pinned at r = \d/)
    await reviewerPage.getByLabel('Your remark').fill('This shell lies well above the reference; is the window too small?')
    await reviewerPage.getByRole('button', { name: 'Post the remark' }).click()
    await reviewerPage.getByTestId('remark-thread').first().waitFor()
    await reviewerPage.locator('[data-testid="figure-chart"] .remarkpins_marks path').first().waitFor({ timeout: 10_000 })
    await reviewerPage.screenshot({ path: `${shots}/04-remark.png`, fullPage: true })
  }, 120_000)

  it('the author is e-mailed, opens the remark and replies', async () => {
    const notice = await waitForMail(authorAddress, /opened a remark on figure 1/)
    expect(notice.text).toContain('Reviewer 1')
    const link = linkIn(notice, `/c/${slug}/figures/1`)
    await open(authorPage, new URL(link).pathname + new URL(link).hash)
    const thread = authorPage.getByTestId('remark-thread').filter({ hasText: 'is the window too small?' })
    await thread.waitFor()
    await expect(thread.getByTestId('remark-writer').first().textContent()).resolves.toBe('Reviewer 1')
    const id = await thread.getAttribute('data-remark-id')
    await authorPage.getByLabel(`Reply to remark ${id}`).fill('The window was 0.9 of the support; the corrected file follows.')
    await thread.getByRole('button', { name: 'Send the reply' }).click()
    await expect.poll(() => thread.getByTestId('remark-message').count(), { timeout: 10_000 }).toBe(2)
    // The reviewer hears of the answer.
    await waitForMail(reviewerAddress, /replied to a remark on figure 1/)
  }, 120_000)

  it('the author uploads a corrected ensemble and the figure recomputes', async () => {
    const before = await authorPage.evaluate(async (s) => {
      const reply = await fetch(`/api/companions/${s}/figures/1`)
      return JSON.stringify(((await reply.json()) as { tables?: unknown }).tables ?? null)
    }, slug)
    await open(authorPage, `/c/${slug}/data/${ensembleId}`)
    await authorPage.getByTestId('replace-file').setInputFiles({ name: 'spiral-corrected.csv', mimeType: 'text/csv', buffer: Buffer.from(spiral(400, 2.4)) })
    await authorPage.getByLabel('What was corrected').fill('The angle step was rounded in the first export.')
    await authorPage.getByTestId('replace-submit').click()
    await authorPage.getByText(/Replaced at revision [0-9a-f]{10}; 1 computation\(s\) queued again\./).waitFor({ timeout: 60_000 })
    await waitForFigureStatus(authorPage, 1, 'current')
    const after = await authorPage.evaluate(async (s) => {
      const reply = await fetch(`/api/companions/${s}/figures/1`)
      return JSON.stringify(((await reply.json()) as { tables?: unknown }).tables ?? null)
    }, slug)
    expect(after).not.toBe(before)
    await open(authorPage, `/c/${slug}/figures/1`)
    await authorPage.getByTestId('figure-status-current').first().waitFor()
  }, 120_000)

  it('the editor accepts and publishes the companion', async () => {
    for (const [action, reason] of [['Accept', 'Both points raised are answered.'], ['Publish', 'The manuscript has appeared.']] as const) {
      await open(editorPage, `/c/${slug}/course`)
      await editorPage.getByLabel(new RegExp(`^${action}`)).check()
      await editorPage.getByLabel('Reason').fill(reason)
      await editorPage.getByTestId('course-move-submit').click()
      await editorPage.getByText(action === 'Accept' ? 'Now accepted.' : 'Now published.', { exact: false }).waitFor()
    }
    await expect(editorPage.getByTestId('course-events').textContent()).resolves.toContain('The manuscript has appeared.')
    await editorPage.screenshot({ path: `${shots}/06-published.png`, fullPage: true })
  }, 120_000)

  it('an anonymous reader opens the page, sees the live figure and downloads the dataset', async () => {
    const reader = await newPage()
    await open(reader, '/')
    await reader.getByTestId('published-search').fill('two-dimensional plasma')
    await reader.getByRole('link', { name: title }).first().click()
    await reader.waitForURL(`**/c/${slug}`)
    await reader.locator('html[data-ready="true"]').waitFor()
    const shown = reader.getByTestId('companion-page')
    await shown.locator('.katex').first().waitFor()
    await shown.getByTestId('figure-plate-1').waitFor()
    await shown.locator('[data-testid="figure-chart"] svg, [data-testid="figure-chart"] canvas').first().waitFor({ timeout: 20_000 })
    await reader.screenshot({ path: `${shots}/07-reader.png`, fullPage: true })
    await open(reader, `/c/${slug}/data/${ensembleId}`)
    const [download] = await Promise.all([reader.waitForEvent('download'), reader.getByTestId('download-csv').click()])
    const saved = await download.path()
    const rows = readFileSync(saved!, 'utf8').trim().split('\n')
    // The corrected file: 400 points (and a header), the first one at angle 0 and radius √(0.5/400).
    expect(rows.filter(r => /^-?\d/.test(r))).toHaveLength(400)
    expect(Number(rows.find(r => /^-?\d/.test(r))!.split(',')[0])).toBeCloseTo(Math.sqrt(0.5 / 400), 12)
  }, 120_000)

  it('never let the reviewer\'s identity reach the author', async () => {
    expect(seenByAuthor.length).toBeGreaterThan(20)
    const everything = seenByAuthor.join('\n')
    expect(everything).not.toContain(reviewerName)
    expect(everything).not.toContain(reviewerAddress)
    const mail = (await mailTo(authorAddress)).map(m => `${m.subject}\n${m.text}\n${m.html}`).join('\n')
    expect(mail).not.toContain(reviewerName)
    expect(mail).not.toContain(reviewerAddress)
  }, 120_000)
})
