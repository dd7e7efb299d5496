/**
 * The content security policy in real Chromium: every main view, in light and dark, renders
 * without a single CSP violation (console error or securitypolicyviolation event), and the
 * policy really blocks an inline script (so the listener is known to work).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { openBrowser, screenshot, signIn, type Browser } from './support/browser'
import { startServer, type RunningServer } from './support/server'
import { mainViews, openView, type AppView } from './support/views'

declare global {
  interface Window {
    __cspViolations?: string[]
  }
}

let server: RunningServer
let views: AppView[]
beforeAll(async () => {
  server = await startServer()
  const found = await mainViews(server.url)
  views = found.views
  if (found.skipped.length) console.log('views not walked:', found.skipped.join('; '))
})
afterAll(async () => {
  await server?.stop()
})

/** Records every CSP violation the page reports, from the first script on. */
async function watchViolations(page: Page): Promise<string[]> {
  const seen: string[] = []
  const listen = (msg: { type(): string; text(): string }) => {
    if (msg.type() === 'error' && /Content Security Policy/i.test(msg.text())) seen.push(msg.text())
  }
  page.on('console', listen)
  // the design map computes in a worker, whose console is its own
  page.on('worker', (worker) => worker.on('console', listen))
  await page.addInitScript(() => {
    window.__cspViolations = []
    document.addEventListener('securitypolicyviolation', (e) => {
      window.__cspViolations!.push(`${e.violatedDirective} blocked ${e.blockedURI || 'inline'} (${e.sourceFile}:${e.lineNumber})`)
    })
  })
  return seen
}

const pageViolations = (page: Page) => page.evaluate(() => window.__cspViolations ?? [])

for (const theme of ['light', 'dark'] as const) {
  describe(`the content security policy in Chromium (${theme})`, () => {
    let browser: Browser
    let console_: string[]
    beforeAll(async () => {
      browser = await openBrowser({ colorScheme: theme })
      console_ = await watchViolations(browser.page)
    })
    afterAll(async () => {
      await browser?.close()
    })

    it('the sign-in view runs without a violation', async () => {
      const { page } = browser
      await page.goto(`${server.url}/signin`)
      await page.getByLabel('E-mail').waitFor()
      await page.waitForLoadState('networkidle')
      expect(await pageViolations(page)).toEqual([])
      expect(console_).toEqual([])
    })

    it('every signed-in view runs without a violation', async () => {
      const { page } = browser
      await signIn(page, server.url, 'admin@demo.flexshelf.test')
      await page.waitForURL(`${server.url}/`)
      const found: Record<string, string[]> = {}
      for (const view of views) {
        await openView(page, server.url, view)
        const observed = [...(await pageViolations(page)), ...console_.splice(0)]
        if (observed.length) found[view.name] = observed
      }
      await screenshot(page, `security-last-view-${theme}`)
      expect(found).toEqual({})
    })

    it('blocks an inline script, so a violation would have been seen', async () => {
      const { page } = browser
      await page.goto(`${server.url}/`)
      await page.waitForLoadState('networkidle')
      const ran = await page.evaluate(async () => {
        const s = document.createElement('script')
        s.textContent = 'window.__inlineRan = true'
        document.body.appendChild(s)
        await new Promise((r) => setTimeout(r, 100))
        return (window as unknown as { __inlineRan?: boolean }).__inlineRan === true
      })
      expect(ran).toBe(false)
      expect((await pageViolations(page)).some((v) => v.startsWith('script-src'))).toBe(true)
    })
  })
}
