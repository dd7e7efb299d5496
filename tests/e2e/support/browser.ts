import { mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { chromium, type BrowserContext, type Page } from 'playwright-core'

// Debian's Chromium; playwright-core never downloads a browser of its own.
const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium'
const FLAGS = [
  '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
  '--disable-background-networking', '--disable-component-update', '--disable-sync',
]
export const SCREENSHOT_DIR = resolve('screenshots')

export interface Browser {
  context: BrowserContext
  page: Page
  close: () => Promise<void>
}

/** A fresh Chromium profile for every test file. */
export async function openBrowser(options: { colorScheme?: 'light' | 'dark' } = {}): Promise<Browser> {
  const userDataDir = mkdtempSync(join(tmpdir(), 'flexshelf-chromium-'))
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: CHROMIUM,
    headless: true,
    args: FLAGS,
    viewport: { width: 1280, height: 800 },
    colorScheme: options.colorScheme ?? 'light',
    acceptDownloads: true,
  })
  const page = context.pages()[0] ?? (await context.newPage())
  return {
    context,
    page,
    close: async () => {
      await context.close()
      rmSync(userDataDir, { recursive: true, force: true })
    },
  }
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true })
  const path = join(SCREENSHOT_DIR, `${name}.png`)
  await page.screenshot({ path, fullPage: true })
  return path
}

/** Signs in through the real form. */
export async function signIn(page: Page, baseUrl: string, email: string, password = 'flexshelf-demo'): Promise<void> {
  await page.goto(`${baseUrl}/signin`)
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}
