import { mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium } from 'playwright-core'
import Papa from 'papaparse'
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, screenshot, signIn, type Browser } from './support/browser'
import { startServer, type RunningServer } from './support/server'

// The engineer's main path in real Chromium: entry → configure against a force window →
// verdict follows the thickness → printability fix → STL, CSV, data sheet → save and share.
describe('configure a module and take it to the printer', () => {
  let server: RunningServer
  let browser: Browser
  let page: Page
  let shareLink = ''

  beforeAll(async () => {
    server = await startServer()
    browser = await openBrowser()
    page = browser.page
  })
  afterAll(async () => {
    await browser?.close()
    await server?.stop()
  })

  /** A screenshot in the light theme, then the same state in the dark one. */
  async function bothThemes(name: string) {
    await page.waitForTimeout(300) // let the plot finish drawing
    await screenshot(page, `${name}-light`)
    await page.getByRole('button', { name: 'Switch to dark theme' }).click()
    await page.waitForTimeout(500)
    await screenshot(page, `${name}-dark`)
    await page.getByRole('button', { name: 'Switch to light theme' }).click()
    await page.waitForTimeout(300)
  }

  const nominalVerdict = () => page.getByTestId('verdict-nominal').locator('.word')

  async function setThickness(value: string) {
    const input = page.locator('#param-thickness')
    await input.fill(value)
    await input.blur()
  }

  it('opens the configure screen from a bistable entry and judges it against a window', async () => {
    await signIn(page, server.url, 'engineer@demo.flexshelf.test')
    await page.waitForURL(`${server.url}/`)
    await page.getByRole('row').filter({ hasText: 'Power switch, field node shell S1' }).click()
    await page.waitForURL(/\/entries\/\d+$/)
    // a snap-over force window set on the entry page travels with the parameters
    await page.locator('#window-min').fill('3')
    await page.locator('#window-max').fill('5')
    await page.locator('#window-max').blur()
    await page.getByRole('link', { name: 'Configure and download' }).click()
    await page.waitForURL(/\/entries\/\d+\/configure\?params=/)
    await page.getByRole('heading', { name: 'Power switch, field node shell S1' }).waitFor()
    expect(await page.locator('#window-peakForce-min').inputValue()).toBe('3')
    expect(await page.locator('#window-peakForce-max').inputValue()).toBe('5')
    // without any window there is no verdict, only the strain
    await page.locator('#window-peakForce-min').fill('')
    await page.locator('#window-peakForce-max').fill('')
    await page.getByText('Set a force window to see whether this part is inside it').waitFor({ timeout: 20_000 })

    // snaps over at 3–6 N (6 N: the 6 mm deep beams bend as plate strips, docs/references.md §8a) and holds with at least 0.5 N
    await page.locator('#window-peakForce-min').fill('3')
    await page.locator('#window-peakForce-max').fill('6')
    await page.locator('#window-holdingForce-min').fill('0.5')
    await page.locator('#window-holdingForce-min').blur()
    // thickness 0.7 mm at the entry's defaults: peak about 4.3 N (the demo entry's own numbers)
    await expect.poll(() => nominalVerdict().textContent(), { timeout: 20_000 }).toBe('Inside the window')
    const band = page.getByTestId('verdict-band')
    await band.waitFor()
    expect(await band.textContent()).toMatch(/±0\.05 mm walls, ±10 % modulus/)
    // the curve carries the band and the window; the legend names the band
    const plot = page.locator('figure.configure-curve [role="img"]')
    expect(await plot.getAttribute('aria-label')).toMatch(/tolerance band.*window/i)
    await page.getByRole('rowheader', { name: 'Peak force at least 3 N' }).waitFor()
    await page.getByText('Common FDM practice', { exact: false }).first().waitFor()
  })

  it('draws the part in 3D (software WebGL) and lays it out to fit', async () => {
    const canvas = page.locator('canvas[aria-label^="3D preview"]')
    await canvas.waitFor()
    await expect.poll(() => page.locator('.preview-part figcaption').textContent(), { timeout: 20_000 }).toMatch(/Outer size .* mm/)
    // sample the drawn pixels: a rendered part shows many shades, a blank canvas one
    const shades = await canvas.evaluate((el: HTMLCanvasElement) => {
      const copy = document.createElement('canvas')
      copy.width = el.width
      copy.height = el.height
      const ctx = copy.getContext('2d')!
      ctx.drawImage(el, 0, 0)
      const { data } = ctx.getImageData(0, 0, copy.width, copy.height)
      const seen = new Set<number>()
      for (let i = 0; i < data.length; i += 4 * 97) seen.add((data[i] >> 3) * 1024 + (data[i + 1] >> 3) * 32 + (data[i + 2] >> 3))
      return seen.size
    })
    expect(shades).toBeGreaterThan(8)
    await bothThemes('configure-inside')
  })

  it('turns the verdict to outside when the beams get thicker, and offers the printable thickness', async () => {
    await setThickness('0.9')
    // force grows with the cube of thickness: 0.9 mm gives about 5.5 N in plain beam theory, and the
    // 6 mm deep beams (6.7 × their thickness) bend as plate strips, ×1/(1−0.38²): about 6.4 N, above the 6 N bound
    await expect.poll(() => nominalVerdict().textContent(), { timeout: 20_000 }).toBe('Outside')
    const peakRow = page.getByRole('row').filter({ has: page.getByRole('rowheader', { name: 'Peak force at most 6 N' }) })
    await expect.poll(() => peakRow.textContent()).toMatch(/6\.4\d? N\s*−\d+ %/)
    const fix = page.getByRole('button', { name: 'Set beam thickness to 0.8 mm' })
    await fix.waitFor({ timeout: 20_000 })
    await page.getByText('0.9 mm is 2.25 perimeters').waitFor()
    await bothThemes('configure-outside')

    await fix.click()
    await expect.poll(() => page.locator('#param-thickness').inputValue()).toBe('0.80')
    await expect.poll(() => nominalVerdict().textContent(), { timeout: 20_000 }).toBe('Inside the window')
    // 0.8 mm is two whole perimeters of a 0.4 mm nozzle: no fix left to offer
    await expect.poll(() => page.getByRole('button', { name: /^Set beam thickness/ }).count(), { timeout: 20_000 }).toBe(0)
  })

  it('downloads a binary STL whose header matches its size, under the server\'s file name', async () => {
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download STL' }).click()])
    const name = download.suggestedFilename()
    expect(name).toBe('power-switch-field-node-shell-s1-bistable-beam-span60-ah2.1-t0.8-depth6-pl0.stl')
    const bytes = readFileSync((await download.path())!)
    // binary STL: 80-byte header, uint32 triangle count, 50 bytes per triangle
    const triangles = bytes.readUInt32LE(80)
    expect(triangles).toBeGreaterThan(100)
    expect(bytes.length).toBe(84 + 50 * triangles)
  })

  it('downloads the predicted curve as CSV with units in the header', async () => {
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download CSV' }).click()])
    expect(download.suggestedFilename()).toMatch(/^power-switch-field-node-shell-s1-bistable-beam-.*-curve\.csv$/)
    const text = readFileSync((await download.path())!, 'utf8')
    const rows = Papa.parse<string[]>(text.trim(), { newline: '\r\n' }).data
    expect(rows[0].slice(0, 2)).toEqual(['Shuttle displacement (mm)', 'Force (N)'])
    expect(rows[0].some((h) => /tolerance low/.test(h))).toBe(true)
    expect(rows.length).toBeGreaterThan(20)
    for (const row of rows.slice(1)) expect(row.map(Number).every(Number.isFinite)).toBe(true)
  })

  it('opens the printable data sheet and its PDF', async () => {
    await page.getByRole('link', { name: 'Data sheet' }).click()
    await page.waitForURL(/\/datasheet\?/)
    await page.getByRole('heading', { name: 'Power switch, field node shell S1' }).waitFor({ timeout: 20_000 })
    await page.getByRole('heading', { name: 'Before relying on these numbers' }).waitFor()
    await page.getByText(/confirm them on printed parts/).first().waitFor()
    await page.locator('article.paper canvas').first().waitFor()
    expect(await page.locator('article.paper').textContent()).toMatch(/Beam thickness\s*0\.8 mm/)
    await bothThemes('configure-datasheet')
    // the print layout leaves the nav and the buttons off the paper
    await page.emulateMedia({ media: 'print' })
    expect(await page.locator('header.nav').isVisible()).toBe(false)
    expect(await page.getByRole('button', { name: 'Download PDF' }).isVisible()).toBe(false)
    await screenshot(page, 'configure-datasheet-print')
    await page.emulateMedia({ media: 'screen' })

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download PDF' }).click()])
    expect(download.suggestedFilename()).toMatch(/-datasheet\.pdf$/)
    expect(readFileSync((await download.path())!).subarray(0, 5).toString('latin1')).toBe('%PDF-')
    await page.getByRole('link', { name: '← Back to the configuration' }).click()
    await page.waitForURL(/\/configure\?/)
  })

  it('saves the configuration, lists it and shares a read-only link', async () => {
    await expect.poll(() => nominalVerdict().textContent(), { timeout: 20_000 }).toBe('Inside the window')
    await page.getByRole('button', { name: 'Save configuration' }).click()
    await page.getByLabel('Name').fill('Power switch, firmer for gloves')
    await page.getByRole('button', { name: 'Save', exact: true }).click()
    await page.waitForURL(/configure\?configuration=\d+/)
    await page.getByRole('heading', { name: 'Power switch, firmer for gloves' }).waitFor()
    // what was saved comes back: the thickness and the window
    await expect.poll(() => page.locator('#param-thickness').inputValue(), { timeout: 20_000 }).toBe('0.80')
    expect(await page.locator('#window-peakForce-max').inputValue()).toBe('6')

    await page.getByRole('link', { name: 'My configurations' }).click()
    await page.getByRole('heading', { name: 'My configurations' }).waitFor()
    expect(new URL(page.url()).pathname).toBe('/configurations')
    const row = page.getByRole('row').filter({ hasText: 'Power switch, firmer for gloves' })
    await row.waitFor()
    expect(await row.textContent()).toMatch(/Power switch, field node shell S1/)
    expect(await row.textContent()).toMatch(/r1/)
    await row.getByRole('button', { name: 'Share' }).click()
    const link = row.locator('.share-link')
    await link.waitFor()
    shareLink = (await link.textContent())!.trim()
    expect(shareLink).toMatch(new RegExp(`^${server.url}/shared/[\\w-]{32}$`))
    await bothThemes('configure-saved-list')
  })

  it('opens the shared link read only, with the same verdict', async () => {
    await page.goto(shareLink)
    await page.getByRole('heading', { name: 'Power switch, firmer for gloves' }).waitFor({ timeout: 20_000 })
    await page.getByText('Shared with you, read only').waitFor()
    await expect.poll(() => nominalVerdict().textContent(), { timeout: 20_000 }).toBe('Inside the window')
    expect(await page.getByRole('button', { name: 'Save configuration' }).count()).toBe(0)
    expect(await page.locator('#param-thickness').count()).toBe(0) // parameters are listed, not editable
    expect(await page.locator('#window-peakForce-max').isDisabled()).toBe(true)
    await bothThemes('configure-shared')

    // the shared data sheet comes from the share link's own route and names the configuration
    await page.getByRole('link', { name: 'Data sheet' }).click()
    await page.waitForURL(/\/datasheet\?shared=/)
    await page.locator('article.paper').getByText('Power switch, firmer for gloves').waitFor({ timeout: 20_000 })
    expect(await page.locator('article.paper').textContent()).toMatch(/Beam thickness\s*0\.8 mm/)
    await page.getByRole('link', { name: '← Back to the configuration' }).click()
    await page.waitForURL(/\/shared\//)
    await page.getByRole('button', { name: 'Copy to my configurations' }).waitFor({ timeout: 20_000 })

    // a colleague may keep a copy of their own
    await page.getByRole('button', { name: 'Copy to my configurations' }).click()
    expect(await page.getByLabel('Name').inputValue()).toBe('Copy of Power switch, firmer for gloves')
    await page.getByRole('button', { name: 'Copy', exact: true }).click()
    await page.waitForURL(/configure\?configuration=\d+/)
    await page.getByRole('heading', { name: 'Copy of Power switch, firmer for gloves' }).waitFor()
    await expect.poll(() => nominalVerdict().textContent(), { timeout: 20_000 }).toBe('Inside the window')
  })

  it('deletes a saved configuration after asking', async () => {
    await page.goto(`${server.url}/configurations`)
    const row = page.getByRole('row').filter({ has: page.getByRole('link', { name: 'Power switch, firmer for gloves', exact: true }) })
    await row.waitFor()
    expect(await page.locator('tbody tr').count()).toBe(2)
    await row.getByRole('button', { name: 'Delete' }).click()
    await page.locator('.n-dialog').getByRole('button', { name: 'Delete' }).click()
    await expect.poll(() => page.locator('tbody tr').count()).toBe(1)
    await page.getByRole('link', { name: 'Copy of Power switch, firmer for gloves' }).waitFor()
    // a link can be withdrawn without deleting the configuration
    const copy = page.getByRole('row').filter({ hasText: 'Copy of Power switch' })
    await copy.getByRole('button', { name: 'Share' }).click()
    const copyLink = (await copy.locator('.share-link').textContent())!.trim()
    await copy.getByRole('button', { name: 'Stop sharing' }).click()
    await copy.getByRole('button', { name: 'Share' }).waitFor()
    const token = await page.evaluate(() => localStorage.getItem('flexshelf.token'))
    const res = await fetch(`${server.url}/api/shared/${copyLink.split('/').pop()}`, { headers: { authorization: `Bearer ${token}` } })
    expect(res.status).toBe(404)
    // the shared link stops working with it
    await page.goto(shareLink)
    await page.getByText(/This configuration is not there/).waitFor({ timeout: 20_000 })
  })

  it('says plainly that the 3D preview is unavailable when the browser has no WebGL', async () => {
    // the same headless flags as support/browser.ts, with WebGL switched off
    const dir = mkdtempSync(join(tmpdir(), 'flexshelf-chromium-nogl-'))
    const context = await chromium.launchPersistentContext(dir, {
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      headless: true,
      viewport: { width: 1280, height: 800 },
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-webgl', '--disable-3d-apis'],
    })
    try {
      const other = context.pages()[0] ?? (await context.newPage())
      await signIn(other, server.url, 'engineer@demo.flexshelf.test')
      await other.waitForURL(`${server.url}/`)
      await other.goto(`${server.url}/entries/1/configure`)
      await other.getByText('This browser cannot draw the 3D preview').waitFor({ timeout: 20_000 })
      expect(await other.locator('canvas[aria-label^="3D preview"]').isVisible()).toBe(false)
      await other.locator('.preview-part').screenshot({ path: join('screenshots', 'configure-preview-no-webgl.png') })
    } finally {
      await context.close()
      rmSync(dir, { recursive: true, force: true })
    }
  })
})
