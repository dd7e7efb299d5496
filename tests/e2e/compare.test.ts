/**
 * From search to a decision in real Chromium: search a bistable switch and a hinge, choose
 * results to compare, read the Compare screen (curves, best marked, printability), and take
 * the 3MF and DXF of the bistable and the hinge candidate, read back with fflate and dxf-parser.
 */
import { readFileSync } from 'node:fs'
import { afterAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { strFromU8, unzipSync } from 'fflate'
import DxfParser from 'dxf-parser'
import { openBrowser, screenshot, signIn, type Browser } from './support/browser'
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

async function downloadOf(name: string): Promise<{ file: string; bytes: Buffer }> {
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name }).click()])
  return { file: download.suggestedFilename(), bytes: readFileSync((await download.path())!) }
}

describe('search → compare → files', () => {
  it('chooses two switches and a hinge from search results', async () => {
    server = await startServer()
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
    await expect.poll(() => page.locator('.results-table tbody tr').first().textContent()).toMatch(/hinge/i)
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
})
