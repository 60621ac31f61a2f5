// Debian's chromium driven by playwright-core (never a downloaded browser). Playwright gives
// each launch a fresh, empty profile of its own.
import { chromium } from 'playwright-core'
import type { Browser } from 'playwright-core'

export async function launchBrowser(): Promise<Browser> {
  const executablePath = process.env.QF_CHROMIUM || '/usr/bin/chromium'
  return chromium.launch({
    executablePath,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run', '--disable-sync', '--disable-quic'],
  })
}
