/**
 * Accessibility in real Chromium: axe-core (its default WCAG 2.x A/AA and best-practice
 * rules, color-contrast among them) on every main view in the light and the dark theme, with
 * no serious or critical violation; and keyboard-only use: Tab alone reaches every control
 * of the sign-in form and of the shelf.
 */
import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { openBrowser, screenshot, signIn, type Browser } from './support/browser'
import { startServer, type RunningServer } from './support/server'
import { mainViews, openView, type AppView } from './support/views'

const AXE_SOURCE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8')

interface Violation {
  id: string
  impact: string | null
  help: string
  count: number
  nodes: string[]
}

/** axe on the page as it is now; evaluated through the DevTools protocol, so the page's CSP does not block it. */
async function seriousViolations(page: Page): Promise<Violation[]> {
  const loaded = await page.evaluate(() => typeof (window as unknown as { axe?: unknown }).axe !== 'undefined')
  if (!loaded) await page.evaluate(AXE_SOURCE)
  const results = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: Array<{ id: string; impact: string | null; help: string; nodes: Array<{ target: unknown[]; failureSummary?: string }> }> }> } }).axe
    return axe.run(document, { resultTypes: ['violations'] })
  })
  return results.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => ({ id: v.id, impact: v.impact, help: v.help, count: v.nodes.length, nodes: v.nodes.slice(0, 3).map((n) => String(n.target.at(-1)).slice(-160)) }))
}

/** Marks every visible control, presses Tab until each was focused (or twice round), and answers how many there were and which were never focused. */
async function unreachableByTab(page: Page, within = 'body'): Promise<{ controls: number; missing: string[] }> {
  const total = await page.evaluate((scope) => {
    const selector = 'a[href], button, input:not([type="hidden"]), select, textarea, [tabindex], [role="button"], [role="link"], [role="checkbox"], [role="switch"], [role="combobox"], [role="tab"], [role="radio"]'
    const root = document.querySelector(scope) ?? document.body
    const visible = (el: Element) => {
      const r = el.getBoundingClientRect()
      const style = getComputedStyle(el)
      return r.width > 0 && r.height > 0 && style.visibility !== 'hidden' && style.display !== 'none'
    }
    let n = 0
    for (const el of root.querySelectorAll(selector)) {
      if (!visible(el) || (el as HTMLButtonElement).disabled || el.getAttribute('tabindex') === '-1' || el.getAttribute('aria-hidden') === 'true') continue
      // a control that wraps a focusable one (naive-ui's inputs) counts as reached when its inner one is
      if (el.querySelector('input, textarea, [tabindex]:not([tabindex="-1"])') && !el.matches('a, button')) continue
      el.setAttribute('data-tab-check', String(n++))
    }
    return n
  }, within)
  const reached = new Set<string>()
  await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur())
  for (let i = 0; i < total * 2 + 20 && reached.size < total; i++) {
    await page.keyboard.press('Tab')
    const mark = await page.evaluate(() => {
      const active = document.activeElement
      return active?.closest('[data-tab-check]')?.getAttribute('data-tab-check') ?? null
    })
    if (mark !== null) reached.add(mark)
  }
  const missing = await page.evaluate((seen) => {
    const missing: string[] = []
    for (const el of document.querySelectorAll('[data-tab-check]')) {
      if (!seen.includes(el.getAttribute('data-tab-check')!)) missing.push(`${el.tagName.toLowerCase()}${el.getAttribute('role') ? `[role=${el.getAttribute('role')}]` : ''} "${(el.getAttribute('aria-label') ?? el.textContent ?? '').trim().slice(0, 40)}"`)
      el.removeAttribute('data-tab-check')
    }
    return missing
  }, [...reached])
  return { controls: total, missing }
}

let server: RunningServer
let views: AppView[]
beforeAll(async () => {
  server = await startServer()
  const found = await mainViews(server.url)
  views = found.views
  if (found.skipped.length) console.log('views not checked:', found.skipped.join('; '))
})
afterAll(async () => {
  await server?.stop()
})

for (const theme of ['light', 'dark'] as const) {
  describe(`accessibility in Chromium (${theme} theme)`, () => {
    let browser: Browser
    beforeAll(async () => {
      browser = await openBrowser({ colorScheme: theme })
    })
    afterAll(async () => {
      await browser?.close()
    })

    it('the sign-in view has no serious or critical axe violation, and Tab reaches every control', async () => {
      const { page } = browser
      await page.goto(`${server.url}/signin`)
      await page.getByLabel('E-mail').waitFor()
      expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe(theme)
      expect(await seriousViolations(page)).toEqual([])
      const tab = await unreachableByTab(page)
      // e-mail, password, the sign-in button and the theme switch at least
      expect(tab.controls).toBeGreaterThanOrEqual(4)
      expect(tab.missing).toEqual([])
    })

    it('every signed-in view has no serious or critical axe violation', async () => {
      const { page } = browser
      await signIn(page, server.url, 'admin@demo.flexshelf.test')
      await page.waitForURL(`${server.url}/`)
      const found: Record<string, Violation[]> = {}
      for (const view of views) {
        await openView(page, server.url, view)
        const observed = await seriousViolations(page)
        if (observed.length) {
          found[view.name] = observed
          await screenshot(page, `a11y-${view.name}-${theme}`)
        }
      }
      expect(found).toEqual({})
    })

    it('Tab reaches every control of the shelf', async () => {
      const { page } = browser
      await page.goto(`${server.url}/`)
      await page.getByRole('row').nth(3).waitFor()
      const tab = await unreachableByTab(page)
      expect(tab.controls).toBeGreaterThanOrEqual(6)
      expect(tab.missing).toEqual([])
    })
  })
}
