import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Locator, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, screenshot, SCREENSHOT_DIR, signIn, type Browser } from './support/browser'
import { startServer, type RunningServer } from './support/server'

// Curation in real Chromium: a contributor's test report and proposals, the librarian's
// review, and the notification e-mails in the admin's outbox.
const SWITCH = 'Power switch, field node shell S1'
const SPRING = 'Status button return spring, gateway G2'
const NEW_ENTRY = 'Probe button spring, soil probe P3'
const PRINTER = 'Bench printer B2'
const CHANGES = 'Narrow the pitch to at most 4 mm: wider pitches do not fit the P3 button well.'

describe('curation in the browser', () => {
  let server: RunningServer
  let browser: Browser
  let files: string

  beforeAll(async () => {
    server = await startServer()
    browser = await openBrowser()
    files = mkdtempSync(join(tmpdir(), 'flexshelf-e2e-csv-'))
  })
  afterAll(async () => {
    await browser?.close()
    await server?.stop()
    if (files) rmSync(files, { recursive: true, force: true })
  })

  async function token(page: Page): Promise<string> {
    const value = await page.evaluate(() => localStorage.getItem('flexshelf.token'))
    expect(value).toBeTruthy()
    return value!
  }

  async function api<T>(page: Page, path: string): Promise<T> {
    const res = await fetch(`${server.url}${path}`, { headers: { authorization: `Bearer ${await token(page)}` } })
    expect(res.status).toBe(200)
    return (await res.json()) as T
  }

  /**
   * The same screen in the light and the dark theme; the toggle is clicked in the page, so it
   * works under a modal too. A modal is shot as the viewport shows it; `detail` adds a close-up
   * of one panel.
   */
  async function bothThemes(page: Page, name: string, options: { viewport?: boolean; detail?: Locator } = {}) {
    // toasts fade after a few seconds; they would cover the page in a full-page shot
    if (!options.viewport) await page.locator('.n-message').first().waitFor({ state: 'detached', timeout: 8000 }).catch(() => undefined)
    for (const mode of ['light', 'dark'] as const) {
      if (mode === 'dark') await page.evaluate(() => (document.querySelector('[aria-label="Switch to dark theme"]') as HTMLElement | null)?.click())
      await page.waitForTimeout(450) // let plots and fades settle
      if (options.viewport) {
        mkdirSync(SCREENSHOT_DIR, { recursive: true })
        await page.screenshot({ path: join(SCREENSHOT_DIR, `curation-${name}-${mode}.png`) })
      } else {
        await screenshot(page, `curation-${name}-${mode}`)
      }
      if (options.detail) await options.detail.screenshot({ path: join(SCREENSHOT_DIR, `curation-${name}-detail-${mode}.png`) })
    }
    await page.evaluate(() => (document.querySelector('[aria-label="Switch to light theme"]') as HTMLElement | null)?.click())
    await page.waitForTimeout(250)
  }

  async function switchUser(page: Page, email: string) {
    const out = page.getByRole('button', { name: 'Sign out' })
    if (await out.count()) {
      await out.click()
      await page.waitForURL(/\/signin/)
    }
    await signIn(page, server.url, email)
    await page.waitForURL(`${server.url}/`)
  }

  async function openEntry(page: Page, name: string): Promise<number> {
    await page.goto(`${server.url}/`)
    await page.getByRole('link', { name }).click()
    await page.waitForURL(/\/entries\/\d+$/)
    await page.getByRole('heading', { name }).waitFor()
    return Number(/\/entries\/(\d+)$/.exec(page.url())![1])
  }

  async function pick(page: Page, inputId: string, option: string | RegExp) {
    // the selection box, not its input: a multiple select hides its input until focused
    await page.locator('.n-base-selection').filter({ has: page.locator(`#${inputId}`) }).click()
    await page.locator('.n-base-select-option').filter({ hasText: option }).first().click()
  }

  let reportId = 0

  it('the contributor uploads a measured curve: a bad file is refused with its row and column, a good one waits for review', async () => {
    const { page } = browser
    await switchUser(page, 'contributor@demo.flexshelf.test')
    const entryId = await openEntry(page, SWITCH)
    const { entry } = await api<{ entry: { currentRevision: { id: number }; revisions: Array<{ id: number; curve: { displacement: number[]; force: number[] } }> } }>(page, `/api/entries/${entryId}`)
    const predicted = entry.revisions.find((r) => r.id === entry.currentRevision.id)!.curve
    // a stand run that is the prediction at nine tenths of the stiffness: the fit must find 0.9 × E
    const rows = predicted.displacement.map((d, i) => `${d},${0.9 * predicted.force[i]}`)
    const good = join(files, 'stand-run-07.csv')
    writeFileSync(good, ['Displacement (mm),Force (N)', ...rows].join('\n'))
    const bad = join(files, 'stand-run-06.csv')
    const badRows = [...rows]
    badRows[5] = `${predicted.displacement[5]},n/a` // file row 7: the header is row 1
    writeFileSync(bad, ['Displacement (mm),Force (N)', ...badRows].join('\n'))

    await page.getByRole('button', { name: 'Upload measured curve' }).click()
    const modal = page.locator('.report-upload')
    await modal.waitFor()
    await modal.locator('.csv-upload input[type=file]').setInputFiles(bad)
    await modal.getByText('header row found').waitFor()
    await modal.getByLabel('Printer').fill(PRINTER)
    await modal.getByLabel('Lot').fill('PETG spool 2026-11-A')
    await modal.getByLabel('Test speed').fill('20')
    await modal.getByRole('button', { name: 'Upload for review' }).click()
    const refusal = page.getByRole('alert').filter({ hasText: 'The file was refused at row 7, column 2' })
    await refusal.waitFor()
    expect(await refusal.innerText()).toMatch(/not a number/)
    // the refused cell is marked in the preview
    await modal.locator('td.bad').filter({ hasText: 'n/a' }).waitFor()
    await refusal.scrollIntoViewIfNeeded()
    await bothThemes(page, 'upload-refused', { viewport: true })

    await modal.locator('.csv-upload input[type=file]').setInputFiles(good)
    // a photo of the part: a 1 × 1 px PNG is enough to travel with the report
    const photo = join(files, 'part.png')
    writeFileSync(photo, Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==', 'base64'))
    await modal.locator('.photo-upload input[type=file]').setInputFiles(photo)
    await modal.locator('.report-csv-preview').getByText(`${rows.length} data rows`).waitFor()
    // the columns were detected from the header
    expect(await modal.locator('.dcol').innerText()).toContain('Displacement (mm)')
    expect(await modal.locator('.fcol').innerText()).toContain('Force (N)')
    await modal.locator('.report-csv-preview').scrollIntoViewIfNeeded()
    await bothThemes(page, 'upload-preview', { viewport: true })
    await modal.getByRole('button', { name: 'Upload for review' }).click()
    const done = page.getByText(/Report \d+ uploaded/)
    await done.waitFor()
    reportId = Number(/Report (\d+) uploaded/.exec(await done.innerText())![1])
    await page.locator(`#report-${reportId}`).getByText('Pending review').waitFor()
    await bothThemes(page, 'entry-report-pending-contributor', { detail: page.locator('.report-measured-curves') })
  })

  it('the librarian finds the report in the review queue, accepts it, and the overlay shows the fitted modulus', async () => {
    const { page } = browser
    await switchUser(page, 'librarian@demo.flexshelf.test')
    await page.locator('nav .badge').waitFor()
    await page.getByRole('link', { name: /^Review/ }).click()
    await page.waitForURL(/\/review$/)
    const row = page.getByRole('row').filter({ hasText: `Report ${reportId}` })
    await row.waitFor()
    expect(await row.innerText()).toContain(PRINTER)
    await bothThemes(page, 'review-queue')
    await row.getByRole('link', { name: SWITCH }).click()
    await page.waitForURL(/\/entries\/\d+#report-/)
    const card = page.locator(`#report-${reportId}`)
    await card.getByRole('button', { name: 'Accept' }).click()
    await page.locator('.n-dialog').getByRole('button', { name: 'Accept' }).click()
    await card.getByText('Accepted').waitFor()
    // the measurement is the prediction × 0.9 at the same displacements, so the least-squares
    // scale is 0.9 exactly and E_eff = 0.9 × 2000 MPa (PETG, the revision's material)
    const text = await card.innerText()
    expect(text).toContain('1,800 MPa')
    expect(text).toContain('× 0.9')
    await page.locator('.report-measured-curves .calibration').getByText('1,800 MPa').waitFor()
    // peak force measured vs predicted: −10 %
    expect(text).toMatch(/Peak force[\s\S]*−10 %/)
    const entryId = Number(/\/entries\/(\d+)/.exec(page.url())![1])
    const { entry } = await api<{ entry: { reports: Array<{ id: number; status: string }> } }>(page, `/api/entries/${entryId}`)
    expect(entry.reports.find((r) => r.id === reportId)?.status).toBe('accepted')

    // the photo is fetched with the session's token and shown in place
    await card.getByRole('button', { name: 'Photo' }).click()
    await page.getByRole('img', { name: /Photo of the printed part/ }).waitFor()
    await page.locator('.n-card-header__close').last().click()
    await page.getByRole('img', { name: /Photo of the printed part/ }).waitFor({ state: 'detached' })

    await card.getByRole('button', { name: `Adopt as calibrated material for ${PRINTER}` }).click()
    await page.locator('.n-dialog').getByRole('button', { name: 'Adopt' }).click()
    await page.getByText(/Added the material/).waitFor()
    const { materials } = await api<{ materials: Array<{ id: string; modulus: number }> }>(page, '/api/materials')
    expect(materials.find((m) => m.id === `petg-cal-r${reportId}`)?.modulus).toBe(1800)
    await page.locator('.report-measured-curves').scrollIntoViewIfNeeded()
    await bothThemes(page, 'entry-report-accepted', { detail: page.locator('.report-measured-curves') })
  })

  it('the contributor proposes a new entry, saves it as a draft and submits it for review', async () => {
    const { page } = browser
    await switchUser(page, 'contributor@demo.flexshelf.test')
    await page.getByRole('link', { name: 'Propose' }).click()
    await page.waitForURL(/\/proposals$/)
    await page.getByRole('button', { name: 'Propose an entry' }).click()
    await page.waitForURL(/\/propose$/)
    await pick(page, 'about-family', 'Serpentine spring')
    await page.getByLabel('Name').fill(NEW_ENTRY)
    await page.getByLabel('Summary').fill('Meander spring under the P3 probe status button, printed with the cap.')
    await pick(page, 'about-materials', 'PETG')
    // the live curve appears for the family's defaults
    await page.locator('canvas').first().waitFor()
    // narrow one allowed range; the default must stay inside
    const highest = page.getByLabel(/Thickness, highest allowed/)
    await highest.fill('0.3')
    await highest.blur()
    await page.getByText(/must lie inside the allowed range|is above the highest|below the family/).first().waitFor()
    await highest.fill('0.9')
    await highest.blur()
    await page.getByRole('button', { name: 'Save draft' }).click()
    await page.waitForURL(/\/proposals\/\d+$/)
    await page.getByText('All changes saved').waitFor()
    await bothThemes(page, 'propose-draft')
    await page.getByRole('button', { name: 'Submit for review' }).click()
    await page.locator('.n-dialog').getByRole('button', { name: 'Submit for review' }).click()
    await page.getByText('Submitted for review.').waitFor()
    await page.locator('.status-badge').filter({ hasText: 'In review' }).waitFor()
    await page.goto(`${server.url}/proposals`)
    await page.getByRole('row').filter({ hasText: NEW_ENTRY }).getByText('Waiting for review').waitFor()
    await bothThemes(page, 'my-proposals')
  })

  it('the contributor proposes a change to a released entry', async () => {
    const { page } = browser
    await openEntry(page, SPRING)
    await page.getByRole('button', { name: 'Propose a change' }).click()
    await page.waitForURL(/\/entries\/\d+\/propose$/)
    // prefilled from the current revision
    expect(await page.getByLabel('Name').inputValue()).toBe(SPRING)
    await page.locator('#param-thickness').fill('0.7')
    await page.locator('#param-thickness').blur()
    await page.locator('canvas').first().waitFor()
    await page.getByRole('button', { name: 'Submit for review' }).click()
    await page.locator('.n-dialog').getByRole('button', { name: 'Submit for review' }).click()
    await page.getByText('Submitted for review.').waitFor()
    await page.waitForURL(/\/proposals\/\d+$/)
    await bothThemes(page, 'propose-change-in-review')
  })

  it('the librarian compares the change with the current revision and releases it, then sends the new entry back for changes', async () => {
    const { page } = browser
    await switchUser(page, 'librarian@demo.flexshelf.test')
    await page.goto(`${server.url}/review`)
    const change = page.getByRole('row').filter({ hasText: `Change to ${SPRING}` })
    await change.waitFor()
    await change.getByRole('link').first().click()
    await page.waitForURL(/\/review\/\d+$/)
    await page.getByText('Proposed curve over the current one').waitFor()
    // the changed thickness is marked in the side-by-side table
    const thickness = page.locator('tr[data-changed="true"]').filter({ hasText: 'Thickness' }).first()
    await thickness.waitFor()
    expect(await thickness.innerText()).toMatch(/0\.6 mm[\s\S]*0\.7 mm/)
    // the spring's stiffness goes with the cube of the blade thickness (Roark 7th ed., Table 8.1,
    // cantilever tip load: k = 3EI/L³, I = bt³/12): (0.7 / 0.6)³ = 1.588, +59 %
    expect(await page.locator('tr[data-changed="true"]').filter({ hasText: 'Stiffness' }).first().innerText()).toContain('+59 %')
    await bothThemes(page, 'review-change')
    await page.getByRole('button', { name: 'Release' }).click()
    await page.locator('.n-dialog').getByRole('button', { name: 'Release' }).click()
    await page.waitForURL(/\/entries\/\d+$/)
    await page.getByRole('heading', { name: SPRING }).waitFor()
    // entry history: revision 1 against revision 2, curves overlaid and the change marked
    const history = page.locator('.history')
    await history.scrollIntoViewIfNeeded()
    await history.locator('tr[data-changed="true"]').filter({ hasText: 'Thickness' }).first().waitFor()
    await bothThemes(page, 'entry-history', { detail: history })

    await page.goto(`${server.url}/review`)
    const proposal = page.getByRole('row').filter({ hasText: NEW_ENTRY })
    await proposal.getByRole('link', { name: NEW_ENTRY }).click()
    await page.waitForURL(/\/review\/\d+$/)
    await page.getByText('Computed curve at the defaults').waitFor()
    await bothThemes(page, 'review-new')
    // asking for changes needs a comment
    await page.getByRole('button', { name: 'Request changes' }).click()
    await page.locator('.n-dialog').getByRole('button', { name: 'Request changes' }).click()
    await page.getByText('Say what should change').waitFor()
    await page.locator('.n-dialog #review-dialog-text').fill(CHANGES)
    await page.locator('.n-dialog').getByRole('button', { name: 'Request changes' }).click()
    await page.getByText('Sent back to the contributor.').waitFor()
    await page.getByText('It is back with its contributor as a draft').waitFor()
    expect(await page.locator('.curation-comments').innerText()).toContain(CHANGES)
  })

  it("the contributor reads the librarian's request, narrows the range and submits again", async () => {
    const { page } = browser
    await switchUser(page, 'contributor@demo.flexshelf.test')
    await page.goto(`${server.url}/proposals`)
    const row = page.getByRole('row').filter({ hasText: NEW_ENTRY })
    await row.getByText('Changes requested').waitFor()
    expect(await row.innerText()).toContain(CHANGES)
    await bothThemes(page, 'my-proposals-changes-requested')
    await row.getByRole('link', { name: NEW_ENTRY }).click()
    await page.waitForURL(/\/proposals\/\d+$/)
    await page.locator('.notice').filter({ hasText: 'Changes requested' }).getByText(CHANGES).waitFor()
    const highest = page.getByLabel(/Pitch, highest allowed/)
    await highest.fill('4')
    await highest.blur()
    await page.getByText('Unsaved changes').waitFor()
    await bothThemes(page, 'propose-changes-requested')
    // submitting saves the edit first
    await page.getByRole('button', { name: 'Submit for review' }).click()
    await page.locator('.n-dialog').getByRole('button', { name: 'Submit for review' }).click()
    await page.getByText('Submitted for review.').waitFor()
    const id = Number(/\/proposals\/(\d+)$/.exec(page.url())![1])
    const { entry } = await api<{ entry: { status: string; ranges: Record<string, [number, number]> } }>(page, `/api/entries/${id}`)
    expect(entry.status).toBe('in_review')
    expect(entry.ranges.pitch).toEqual([0.8, 4])
  })

  it('the librarian releases the new entry; it is on the shelf, and retiring it says what that means', async () => {
    const { page } = browser
    await switchUser(page, 'librarian@demo.flexshelf.test')
    await page.goto(`${server.url}/review`)
    await page.getByRole('row').filter({ hasText: NEW_ENTRY }).getByRole('link', { name: NEW_ENTRY }).click()
    await page.waitForURL(/\/review\/\d+$/)
    await page.getByText('Computed curve at the defaults').waitFor()
    await page.getByRole('button', { name: 'Release' }).click()
    await page.locator('.n-dialog').getByRole('button', { name: 'Release' }).click()
    await page.waitForURL(/\/entries\/\d+$/)
    await page.goto(`${server.url}/`)
    await page.getByRole('row').filter({ hasText: NEW_ENTRY }).filter({ hasText: 'Released' }).waitFor()

    await openEntry(page, NEW_ENTRY)
    await page.getByRole('button', { name: 'Retire' }).click()
    const confirm = page.locator('.n-dialog')
    expect(await confirm.innerText()).toMatch(/stays readable[\s\S]*hidden from search[\s\S]*saved configurations/)
    await bothThemes(page, 'retire-confirm', { viewport: true })
    await confirm.getByRole('button', { name: 'Retire' }).click()
    await page.locator('.status-badge').filter({ hasText: 'Retired' }).waitFor()
  })

  it('the admin reads the notification e-mails in the outbox', async () => {
    const { page } = browser
    await switchUser(page, 'admin@demo.flexshelf.test')
    await page.getByRole('link', { name: 'Outbox' }).click()
    await page.waitForURL(/\/admin\/outbox$/)
    const rows = page.locator('.outbox tbody tr')
    await rows.first().waitFor()
    const text = await page.locator('.outbox').innerText()
    expect(text).toContain(`a test report on "${SWITCH}" waits for review`)
    expect(text).toContain(`your test report on "${SWITCH}" was accepted`)
    expect(text).toContain(`"${NEW_ENTRY}"`)
    expect(text).toMatch(/was released/)
    expect(text).toContain(`changes requested on "${NEW_ENTRY}"`)
    expect(text).toContain('librarian@demo.flexshelf.test')
    expect(text).toContain('contributor@demo.flexshelf.test')
    // newest first: the last release is at the top
    expect(await rows.first().innerText()).toMatch(/released/)
    await page.locator('.n-data-table-expand-trigger').first().click()
    await page.locator('.mail-text').first().waitFor()
    await bothThemes(page, 'outbox')
  })
})
