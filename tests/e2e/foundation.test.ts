// The foundation journey in a real browser: sign up, sign in, open a companion, add a member,
// and a signed-in person without a role meets a 404 for the private companion.
import { mkdirSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { launchBrowser } from '../support/browser'
import { baseUrl, uniqueName } from '../support/http'

let browser: Browser
const shots = 'tests/.artifacts/screenshots'

beforeAll(async () => {
  mkdirSync(shots, { recursive: true })
  browser = await launchBrowser()
})

afterAll(async () => {
  await browser?.close()
})

async function newPage(): Promise<Page> {
  const context = await browser.newContext({ baseURL: baseUrl })
  return context.newPage()
}

/** Goes to a path and waits until the page is hydrated (forms work). */
async function visit(page: Page, path: string) {
  const response = await page.goto(path)
  await page.locator('html[data-ready="true"]').waitFor()
  return response
}

async function signUpThroughForm(page: Page, name: string) {
  const email = `${uniqueName(name)}@tests.example`
  await visit(page, '/sign-up')
  await page.getByLabel('Your name').fill(`Browser ${name}`)
  await page.getByLabel('E-mail address').fill(email)
  await page.getByLabel('Password').fill('a long enough password')
  await page.getByTestId('sign-up-submit').click()
  await page.waitForURL('**/desk')
  return email
}

describe('foundation journey', () => {
  const slug = uniqueName('browser-')
  let editorEmail = ''
  let memberEmail = ''
  let editor: Page

  it('signs up through the form and lands on the desk', async () => {
    editor = await newPage()
    editorEmail = await signUpThroughForm(editor, 'editor')
    await expect(editor.getByTestId('desk-empty').textContent()).resolves.toMatch(/not a member of any companion/)
    await expect(editor.getByTestId('account-link').textContent()).resolves.toContain('Browser editor')
  })

  it('signs out and signs in again', async () => {
    await editor.getByTestId('sign-out').click()
    await editor.waitForURL(`${baseUrl}/`)
    await visit(editor, '/desk')
    await editor.waitForURL(/\/sign-in\?redirect=%2Fdesk|\/sign-in\?redirect=\/desk/)
    await editor.getByLabel('E-mail address').fill(editorEmail)
    await editor.getByLabel('Password').fill('wrong password here')
    await editor.getByTestId('sign-in-submit').click()
    await expect(editor.getByTestId('form-message').textContent()).resolves.toMatch(/not right/)
    await editor.getByLabel('Password').fill('a long enough password')
    await editor.getByTestId('sign-in-submit').click()
    await editor.waitForURL('**/desk')
  })

  it('opens a companion from the desk', async () => {
    await editor.getByTestId('companion-create-toggle').click()
    await editor.getByLabel('Manuscript title').fill('Crystallisation of a browser-made plasma')
    await editor.getByLabel('Short name (in the address)').fill(slug)
    await editor.getByLabel('Manuscript identifier').fill('BRW-7')
    await editor.getByLabel('Abstract').fill('An abstract typed in a real browser.')
    await editor.getByTestId('companion-create-submit').click()
    await editor.waitForURL(`**/c/${slug}`)
    await expect(editor.getByTestId('companion-title').textContent()).resolves.toContain('Crystallisation of a browser-made plasma')
    await expect(editor.getByTestId('state-draft').count()).resolves.toBe(1)
    await editor.screenshot({ path: `${shots}/companion.png`, fullPage: true })
  })

  it('adds a member on the people page', async () => {
    const member = await newPage()
    memberEmail = await signUpThroughForm(member, 'coauthor')
    await visit(editor, `/c/${slug}/people`)
    await editor.getByLabel('Their account\'s e-mail address').fill(memberEmail)
    await editor.getByLabel('Role', { exact: true }).selectOption('author')
    await editor.getByTestId('member-add-submit').click()
    await editor.getByTestId(`member-${memberEmail}`).waitFor()
    await expect(editor.getByTestId(`member-${memberEmail}`).textContent()).resolves.toContain('Browser coauthor')
    await editor.screenshot({ path: `${shots}/people.png`, fullPage: true })

    await visit(member, '/desk')
    await member.getByTestId('desk-group-author').waitFor()
    await expect(member.getByTestId('desk-group-author').textContent()).resolves.toContain('Crystallisation of a browser-made plasma')
  })

  it('answers 404 to a signed-in person without a role', async () => {
    const outsider = await newPage()
    await signUpThroughForm(outsider, 'outsider')
    const response = await visit(outsider, `/c/${slug}`)
    expect(response?.status()).toBe(404)
    await expect(outsider.getByTestId('error-page').textContent()).resolves.toMatch(/Nothing here/)
    await expect(outsider.content()).resolves.not.toContain('Crystallisation of a browser-made plasma')
  })

  it('renders the front page and a method page in the dark theme too', async () => {
    const page = await newPage()
    await visit(page, '/')
    await page.getByTestId('theme-switch').selectOption('dark')
    await expect(page.evaluate(() => document.documentElement.classList.contains('dark'))).resolves.toBe(true)
    await visit(page, '/methods/conventions')
    await expect(page.getByTestId('method-page').textContent()).resolves.toContain('canonical convention')
    await expect(page.evaluate(() => document.documentElement.classList.contains('dark'))).resolves.toBe(true)
    await page.screenshot({ path: `${shots}/method-dark.png`, fullPage: true })
    await visit(page, '/guide/pipeline-tokens')
    await expect(page.getByTestId('guide-page').textContent()).resolves.toContain('Authorization: Bearer')
  })
})
