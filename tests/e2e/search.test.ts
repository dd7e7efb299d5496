import { afterAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { openBrowser, screenshot, signIn, type Browser } from './support/browser'
import { startServer, type RunningServer } from './support/server'

// Search by force window in real Chromium, once per theme: each pass has its own server, so its
// first search meets a cold search thread and is still running when Cancel is pressed.
const opened: Array<{ server: RunningServer; browser: Browser }> = []
afterAll(async () => {
  for (const { server, browser } of opened) {
    await browser.close()
    await server.stop()
  }
})

async function mapMeasure(page: Page): Promise<number | null> {
  return page.evaluate(() => {
    const entries = performance.getEntriesByName('design-map', 'measure')
    return entries.length ? entries[entries.length - 1].duration : null
  })
}

for (const theme of ['light', 'dark'] as const) {
  describe(`search in the browser (${theme})`, () => {
    let page: Page
    let url: string

    it('the engineer opens search, starts from a preset, sees the progress and cancels', async () => {
      const server = await startServer()
      const browser = await openBrowser({ colorScheme: theme })
      opened.push({ server, browser })
      page = browser.page
      url = server.url
      await signIn(page, url, 'engineer@demo.flexshelf.test')
      await page.waitForURL(`${url}/`)
      await page.getByRole('link', { name: 'Search', exact: true }).click()
      await page.waitForURL(`${url}/search`)
      await page.getByRole('heading', { name: 'Search the shelf' }).waitFor()
      await page.getByText('No search yet').waitFor()
      await screenshot(page, `search-idle-${theme}`)

      await page.getByRole('button', { name: 'Power switch for a gloved thumb' }).click()
      expect(await page.getByLabel('Peak force at least (N)').inputValue()).toBe('4')
      expect(await page.getByLabel('Peak force at most (N)').inputValue()).toBe('8')
      await page.getByRole('button', { name: 'Find modules' }).click()
      const progress = page.getByRole('status').filter({ hasText: /Starting the search|candidates estimated/ })
      await progress.waitFor()
      await screenshot(page, `search-running-${theme}`)
      await progress.getByRole('button', { name: 'Cancel' }).click()
      await page.getByText('Search cancelled').waitFor()
      await screenshot(page, `search-cancelled-${theme}`)
    })

    it('runs the search to the end and lists ranked results with their curves', async () => {
      await page.getByRole('button', { name: 'Find modules' }).click()
      await page.getByRole('heading', { name: 'Results' }).waitFor({ timeout: 60_000 })
      const rows = page.locator('.results-table tbody tr')
      await rows.first().waitFor()
      expect(await rows.count()).toBeGreaterThan(3)
      await expect.poll(() => page.locator('.results-table tbody tr').first().textContent()).toContain('Power switch, field node shell S1')
      // the first row's curve is fetched and drawn with the window band
      await page.locator('.result-curve path').first().waitFor()
      expect(await page.locator('.result-curve .band').count()).toBeGreaterThan(0)
      expect(await page.getByText(/configurations? · .* candidates estimated/).textContent()).toMatch(/^[1-9]\d* configurations?/)
      await screenshot(page, `search-results-${theme}`)
    })

    it('opens the design-space map of a result and it renders', async () => {
      await page.getByRole('button', { name: 'Design map for result 1' }).filter({ visible: true }).first().click()
      const map = page.locator('.design-map canvas').first()
      await map.waitFor()
      await page.getByText(/Drawn in/).waitFor()
      const ms = await mapMeasure(page)
      console.log(`design map (60 × 60) from request to drawn, ${theme}: ${ms?.toFixed(0)} ms`)
      expect(ms).not.toBeNull()
      expect(await page.getByText(/Outlined: meets the window/).textContent()).toMatch(/\(\d+ cells\)/)
      await page.locator('.design-map').first().scrollIntoViewIfNeeded()
      await screenshot(page, `search-map-${theme}`)
    })

    it('opens a result in the entry screen with its parameters filled in', async () => {
      const first = page.locator('.results-table tbody tr').first()
      const config = await first.locator('.params').textContent()
      const span = /Span\s*([\d.]+) mm/.exec(config ?? '')?.[1]
      expect(span).toBeTruthy()
      await page.getByRole('button', { name: 'Configure Power switch, field node shell S1, result 1' }).filter({ visible: true }).first().click()
      await page.waitForURL(/\/entries\/\d+\?params=/)
      await page.getByRole('heading', { name: 'Power switch, field node shell S1' }).waitFor()
      await expect.poll(async () => Number(await page.locator('#param-span').inputValue())).toBe(Number(span))
      const params = JSON.parse(new URL(page.url()).searchParams.get('params')!)
      expect(Number(await page.locator('#param-thickness').inputValue())).toBe(params.thickness)
      await page.locator('.design-map canvas').first().waitFor()
      await page.getByText(/Drawn in/).waitFor()
      await screenshot(page, `search-entry-${theme}`)
      // back to the results: the answer is kept
      await page.goBack()
      await page.getByRole('heading', { name: 'Results' }).waitFor()
    })
  })
}
