import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, screenshot, signIn, type Browser } from './support/browser'
import { startServer, type RunningServer } from './support/server'

// The foundation path in real Chromium: each demo account sees what its role allows.
describe('foundation in the browser', () => {
  let server: RunningServer
  let browser: Browser

  beforeAll(async () => {
    server = await startServer()
    browser = await openBrowser()
  })
  afterAll(async () => {
    await browser?.close()
    await server?.stop()
  })

  it('the demo engineer signs in, sees the shelf and opens an entry', async () => {
    const { page } = browser
    await signIn(page, server.url, 'engineer@demo.flexshelf.test')
    await page.waitForURL(`${server.url}/`)
    const row = page.getByRole('row').filter({ hasText: 'Power switch, field node shell S1' })
    await row.waitFor()
    expect(await page.getByRole('row').count()).toBeGreaterThan(6)
    await screenshot(page, 'foundation-shelf-engineer')
    // engineers have no admin link
    expect(await page.getByRole('link', { name: /people|users/i }).count()).toBe(0)
    await row.click()
    await page.waitForURL(/\/entries\/\d+$/)
    await page.getByRole('heading', { name: 'Power switch, field node shell S1' }).waitFor()
    await page.locator('canvas').first().waitFor()
    await page.getByText('Peak force').first().waitFor()
    await screenshot(page, 'foundation-entry-engineer')
  })

  it('an engineer sent to the admin page is told it is not for their role', async () => {
    const { page } = browser
    await page.goto(`${server.url}/admin/users`)
    await page.waitForURL(/\/forbidden/)
    await screenshot(page, 'foundation-forbidden-engineer')
  })

  it('the demo admin grants the contributor role to a new engineer', async () => {
    // a fresh engineer signs up through the API, so the admin has someone to promote
    const signup = await fetch(`${server.url}/api/auth/signup`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: 'new.hire@demo.flexshelf.test', password: 'long-enough-secret', displayName: 'Odile Brannock' }),
    })
    expect(signup.status).toBe(201)
    const { page } = browser
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(/\/signin/)
    await signIn(page, server.url, 'admin@demo.flexshelf.test')
    await page.waitForURL(`${server.url}/`)
    await page.goto(`${server.url}/admin/users`)
    const row = page.getByRole('row').filter({ hasText: 'Odile Brannock' })
    await row.waitFor()
    await screenshot(page, 'foundation-admin-users')
    await row.locator('.n-base-selection').click()
    await page.locator('.n-base-select-option').filter({ hasText: /contributor/i }).click()
    // the grant asks for confirmation first
    await page.getByRole('button', { name: 'Grant' }).click()
    // the change reaches the server and is written to the audit log
    const token = await page.evaluate(() => {
      for (const key of Object.keys(localStorage)) {
        const value = localStorage.getItem(key) ?? ''
        const match = value.match(/eyJ[\w-]+\.[\w-]+\.[\w-]+/)
        if (match) return match[0]
      }
      return null
    })
    expect(token).toBeTruthy()
    await expect.poll(async () => {
      const res = await fetch(`${server.url}/api/users`, { headers: { authorization: `Bearer ${token}` } })
      const body = (await res.json()) as { users: Array<{ email: string; role: string }> }
      return body.users.find((u) => u.email === 'new.hire@demo.flexshelf.test')?.role
    }, { timeout: 10_000 }).toBe('contributor')
    const audit = await fetch(`${server.url}/api/audit`, { headers: { authorization: `Bearer ${token}` } })
    const events = ((await audit.json()) as { events: Array<{ action: string }> }).events
    expect(events.some((e) => /role/.test(e.action))).toBe(true)
    await page.getByText('Odile Brannock is now contributor').waitFor()
    await page.waitForTimeout(400) // let the dialog finish fading out
    await screenshot(page, 'foundation-admin-granted')
  })
})
