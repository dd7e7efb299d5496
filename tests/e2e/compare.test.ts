/**
 * From search to a decision in real Chromium: search a bistable switch and a hinge, choose
 * results to compare, read the Compare screen (curves, best marked, printability), and take
 * the 3MF and DXF of the bistable and the hinge candidate, read back with fflate and dxf-parser;
 * open a candidate from the trade-off scatter, compare saved configurations from My
 * configurations, and find the demo's activity (reports, queue) on a first start.
 */
import { mkdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { strFromU8, unzipSync } from 'fflate'
import DxfParser from 'dxf-parser'
import { openBrowser, screenshot, signIn, SCREENSHOT_DIR, type Browser } from './support/browser'
import { startServer, type RunningServer } from './support/server'

let server: RunningServer
let browser: Browser
let page: Page
afterAll(async () => {
  await browser?.close()
  await server?.stop()
})

async function searchPreset(preset: string) {
  await page.getByRole('button', { name: preset }).click()
  await page.getByRole('button', { name: 'Find modules' }).click()
  await page.locator('[data-test="sort-key"]').waitFor({ timeout: 90_000 })
  await page.locator('.results-table tbody tr').first().waitFor()
}

/** A screenshot in each theme (the header's switch), ending in the light one. */
async function bothThemes(name: string, fullPage = true) {
  mkdirSync(SCREENSHOT_DIR, { recursive: true })
  for (const mode of ['light', 'dark'] as const) {
    await page.evaluate((m) => (document.querySelector(`[aria-label="Switch to ${m} theme"]`) as HTMLElement | null)?.click(), mode)
    await page.waitForTimeout(450) // let plots settle
    await page.screenshot({ path: join(SCREENSHOT_DIR, `${name}-${mode}.png`), fullPage })
  }
  await page.evaluate(() => (document.querySelector('[aria-label="Switch to light theme"]') as HTMLElement | null)?.click())
}

async function downloadOf(name: string): Promise<{ file: string; bytes: Buffer }> {
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name }).click()])
  return { file: download.suggestedFilename(), bytes: readFileSync((await download.path())!) }
}

describe('search → compare → files', () => {
  it('chooses two switches and a hinge from search results', async () => {
    // a first start as people get it: the demo shelf and the demo's activity (reports, saved configurations)
    server = await startServer({ FLEXSHELF_DEMO_ACTIVITY: 'on' })
    browser = await openBrowser()
    page = browser.page
    await signIn(page, server.url, 'engineer@demo.flexshelf.test')
    await page.waitForURL(`${server.url}/`)
    await page.goto(`${server.url}/search`)
    await searchPreset('Power switch for a gloved thumb')
    await expect.poll(() => page.locator('.results-table tbody tr').first().textContent()).toContain('Power switch')
    // the shown key is the order of the rows: the margin bands never rise down the page within a tier
    await screenshot(page, 'compare-search-results')
    await page.getByRole('button', { name: 'Compare result 1' }).filter({ visible: true }).first().click()
    await page.getByRole('button', { name: 'Compare result 2' }).filter({ visible: true }).first().click()
    await searchPreset('Lid hinge that swings freely')
    // the previous answer stays on screen while the next search runs
    await expect.poll(() => page.locator('.results-table tbody tr').first().textContent(), { timeout: 90_000 }).toMatch(/hinge/i)
    await page.getByRole('button', { name: 'Compare result 1' }).filter({ visible: true }).first().click()
    await page.getByRole('link', { name: 'Compare 3 chosen →' }).click()
    await page.waitForURL(`${server.url}/compare`)
  })

  it('shows the curves over their bands, metrics with the best marked and printability side by side', async () => {
    await page.getByRole('heading', { name: 'Metrics side by side' }).waitFor({ timeout: 60_000 })
    expect(await page.locator('.plot path').count()).toBe(6)
    expect(await page.locator('.compare-table thead th').count()).toBe(4)
    expect(await page.locator('.best-mark').count()).toBeGreaterThan(0)
    await page.getByRole('heading', { name: 'Printability side by side' }).waitFor()
    await screenshot(page, 'compare-screen')
    await page.locator('#files-title').scrollIntoViewIfNeeded()
    await screenshot(page, 'compare-files')
  })

  it('downloads the 3MF and DXF of the bistable and the hinge candidate', async () => {
    const labels = await page.locator('.file-row strong').allTextContents()
    const switchLabel = labels[0].replace(/^1\. /, '')
    const hingeLabel = labels[2].replace(/^3\. /, '')
    for (const [label, family] of [[switchLabel, 'bistable-beam'], [hingeLabel, 'hinge']] as const) {
      const threeMf = await downloadOf(`Download 3MF of ${label}`)
      expect(threeMf.file).toContain(family)
      expect(threeMf.file).toMatch(/\.3mf$/)
      const model = strFromU8(unzipSync(new Uint8Array(threeMf.bytes))['3D/3dmodel.model'])
      expect(model).toContain('unit="millimeter"')
      expect(model).toContain(`name="${label.replace(/ #\d+$/, '').replace(/&/g, '&amp;')}"`)
      const dxf = await downloadOf(`Download DXF of ${label}`)
      expect(dxf.file).toMatch(/-profile-extrude[\d.]+mm\.dxf$/)
      const parsed = new DxfParser().parseSync(dxf.bytes.toString('utf8'))!
      expect(parsed.header.$INSUNITS).toBe(4)
      expect(parsed.entities.length).toBeGreaterThan(0)
    }
  })

  it('opens a candidate\u2019s configure screen from the trade-off scatter, and switches the scatter to footprint', async () => {
    await page.goto(`${server.url}/search`)
    await searchPreset('Power switch for a gloved thumb')
    const scatter = page.locator('[data-test="tradeoffs"]')
    await scatter.scrollIntoViewIfNeeded()
    await expect.poll(() => scatter.locator('.canvas').getAttribute('data-first-point')).toMatch(/^\d+,\d+$/)
    expect(await scatter.innerText()).toMatch(/listed results and the close variants/)
    await bothThemes('search-tradeoffs')
    await scatter.getByText('Margin vs footprint').click()
    await expect.poll(() => scatter.locator('.canvas').getAttribute('data-first-point')).toMatch(/^\d+,\d+$/)
    await screenshot(page, 'search-tradeoffs-footprint')
    const [x, y] = (await scatter.locator('.canvas').getAttribute('data-first-point'))!.split(',').map(Number)
    await scatter.locator('.canvas > *').first().click({ position: { x, y } })
    await page.waitForURL(/\/entries\/\d+\?params=/)
    const params = JSON.parse(new URL(page.url()).searchParams.get('params')!)
    expect(params.material).toBeTruthy()
    expect(typeof params.span).toBe('number')
    await page.getByRole('heading', { name: /Power switch/ }).first().waitFor()
  })

  it('adds saved configurations to Compare from My configurations', async () => {
    await page.goto(`${server.url}/compare`)
    await page.getByRole('button', { name: 'Clear all' }).click()
    await page.goto(`${server.url}/configurations`)
    await page.getByRole('button', { name: 'Compare S1 switch, firmer for winter gloves (demo)' }).click()
    await page.getByRole('button', { name: 'Compare G2 tamper latch, deeper beam (demo, shared)' }).click()
    await bothThemes('configurations-compare')
    await page.getByRole('link', { name: 'Compare 2 chosen →' }).click()
    await page.waitForURL(`${server.url}/compare`)
    await page.getByRole('heading', { name: 'Metrics side by side' }).waitFor({ timeout: 60_000 })
    expect(await page.locator('.compare-table thead th').count()).toBe(3)
    // the file buttons stay on one line beside the chips
    const heights = await page.locator('.file-actions button').evaluateAll((els) => els.map((e) => e.getBoundingClientRect().top))
    expect(new Set(heights).size).toBe(1)
    await bothThemes('compare-saved')
  })

  it('finds the demo\u2019s activity on a first start: a generated report with its fitted modulus, the review queue', async () => {
    await page.goto(`${server.url}/`)
    await page.getByRole('link', { name: 'Power switch, field node shell S1' }).first().click()
    await page.waitForURL(/\/entries\/\d+/)
    const report = page.locator('.notes').filter({ hasText: 'Not a measurement' }).first()
    await report.waitFor({ timeout: 30_000 })
    expect(await page.getByText('Fitted effective modulus').count()).toBeGreaterThan(0)
    await bothThemes('entry-demo-report')
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(/\/signin/)
    await signIn(page, server.url, 'librarian@demo.flexshelf.test')
    await page.waitForURL(`${server.url}/`)
    await page.goto(`${server.url}/review`)
    await page.getByText('Softer return spring, status button G2 (demo proposal)').first().waitFor({ timeout: 30_000 })
    expect(await page.locator('body').innerText()).toContain('Battery door hinge, field node shell S1')
    await bothThemes('review-queue-demo')
  })
})
