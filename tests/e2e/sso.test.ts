/**
 * Single sign-on through the whole flow in Chromium: `npm run dev:idp` (the local identity
 * provider on oidc-provider) as a real process, the real server configured for it, a person
 * signing in on the provider's page and landing back in Flexshelf with the role their group
 * maps to. Also the account screens around it, photographed.
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, screenshot, type Browser } from './support/browser'
import { startServer, type RunningServer } from './support/server'
import { freePort } from '../../scripts/support/free-port'


function startIdp(port: number, redirectUri: string): Promise<{ child: ChildProcess; output: () => string }> {
  const child = spawn('npm', ['run', '--silent', 'dev:idp'], {
    env: { ...process.env, FLEXSHELF_IDP_PORT: String(port), FLEXSHELF_IDP_REDIRECT_URIS: redirectUri },
    stdio: ['ignore', 'pipe', 'pipe'],
    detached: true,
  })
  let output = ''
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`dev:idp did not start:\n${output}`)), 60_000)
    const onData = (d: Buffer) => {
      output += String(d)
      if (output.includes('Development identity provider at')) {
        clearTimeout(timer)
        resolve({ child, output: () => output })
      }
    }
    child.stdout!.on('data', onData)
    child.stderr!.on('data', onData)
    child.on('exit', (code) => { clearTimeout(timer); reject(new Error(`dev:idp exited (${code}):\n${output}`)) })
  })
}

describe('single sign-on in the browser', () => {
  let server: RunningServer
  let idp: { child: ChildProcess; output: () => string }
  let browser: Browser
  let app: string

  beforeAll(async () => {
    const idpPort = await freePort()
    server = await startServer({
      FLEXSHELF_OIDC_ISSUER: `http://127.0.0.1:${idpPort}`,
      FLEXSHELF_OIDC_CLIENT_ID: 'flexshelf-dev',
      FLEXSHELF_OIDC_CLIENT_SECRET: 'flexshelf-dev-secret',
      FLEXSHELF_OIDC_NAME: 'Lumenwick SSO',
      FLEXSHELF_OIDC_ROLES: JSON.stringify({ 'flexshelf-admins': 'admin', 'flexshelf-librarians': 'librarian', 'flexshelf-contributors': 'contributor' }),
    })
    // the server's public address is http://localhost:<port> by default; the browser uses it too, so cookies match
    app = server.url.replace('127.0.0.1', 'localhost')
    idp = await startIdp(idpPort, `${app}/api/auth/oidc/callback`)
    browser = await openBrowser()
  })
  afterAll(async () => {
    await browser?.close()
    if (idp?.child.pid) process.kill(-idp.child.pid, 'SIGTERM')
    await server?.stop()
  })

  it('dev:idp loads on this Node (warning about Node 22 only)', () => {
    expect(idp.output()).toContain('noor.halvorsen@idp.flexshelf.test')
  })

  it('an admin of the identity provider signs in and arrives as an admin', async () => {
    const { page } = browser
    await page.goto(`${app}/signin?redirect=/admin/audit`)
    const button = page.getByRole('link', { name: 'Sign in with Lumenwick SSO' })
    await button.waitFor()
    await page.getByRole('link', { name: 'Forgot your password?' }).waitFor()
    await screenshot(page, 'sso-signin')
    await button.click()
    await page.waitForURL(/127\.0\.0\.1:\d+\/interaction\//)
    await page.getByLabel('E-mail').fill('noor.halvorsen@idp.flexshelf.test')
    await page.getByLabel('Password').fill('idp-dev-password')
    await screenshot(page, 'sso-idp-login')
    await page.getByRole('button', { name: 'Continue' }).click()
    await page.waitForURL(`${app}/admin/audit`)
    await page.getByRole('heading', { name: 'Audit log' }).waitFor()
    await page.getByText('user.sso_created').first().waitFor()
    expect(await page.locator('.nav .who').textContent()).toContain('Noor Halvorsen')
    expect(await page.locator('.nav .who').textContent()).toMatch(/admin/i)
    await screenshot(page, 'sso-audit-admin')
    // the token is in this browser's storage, never in its address or history
    expect(page.url()).not.toContain('token')
  })

  it('the audit screen filters by action and exports CSV', async () => {
    const { page } = browser
    await page.getByLabel('Action').click()
    await page.locator('.n-base-select-option').filter({ hasText: /^user\.sso_created$/ }).click()
    await page.waitForFunction(() => document.querySelectorAll('.audit tbody tr').length === 1)
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Export CSV' }).click()])
    const csv = await (await import('node:fs/promises')).readFile((await download.path())!, 'utf8')
    expect(csv.split('\r\n')[0]).toBe('at,actor,actor id,action,subject type,subject id,details')
    expect(csv).toContain('user.sso_created')
    expect(csv).not.toContain('user.signup')
    await screenshot(page, 'sso-audit-filtered')
  })

  it('an SSO account has no Flexshelf password to change', async () => {
    const { page } = browser
    await page.locator('.nav .who').click()
    await page.getByText('there is no Flexshelf password to change').waitFor()
    await screenshot(page, 'account-password-sso')
  })

  it('an unconfirmed e-mail is refused with a message saying why', async () => {
    const { page, context } = browser
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(/\/signin/)
    // forget the identity provider's session, so it asks who is signing in
    await context.clearCookies({ domain: '127.0.0.1' })
    await page.getByRole('link', { name: 'Sign in with Lumenwick SSO' }).click()
    // the sign-in page has an E-mail field too: fill only once the provider's page is there
    await page.waitForURL(/127\.0\.0\.1:\d+\/interaction\//)
    await page.getByLabel('E-mail').fill('unverified@idp.flexshelf.test')
    await page.getByLabel('Password').fill('idp-dev-password')
    await page.getByRole('button', { name: 'Continue' }).click()
    await page.waitForURL(/\/signin\?sso_error=email_unverified/)
    await page.getByText('has not confirmed an e-mail address').waitFor()
    await screenshot(page, 'sso-unverified')
  })

  it('a demo engineer changes their password on the account screen', async () => {
    const { page } = browser
    await page.goto(`${app}/signin`)
    await page.getByLabel('E-mail').fill('engineer@demo.flexshelf.test')
    await page.getByLabel('Password', { exact: true }).fill('flexshelf-demo')
    await page.getByRole('button', { name: 'Sign in', exact: true }).click()
    await page.waitForURL(`${app}/`)
    await page.goto(`${app}/account/password`)
    await page.getByLabel('Current password').fill('flexshelf-demo')
    await page.getByLabel('New password', { exact: true }).fill('111111111111')
    await page.getByLabel('New password again').fill('111111111111')
    await page.getByRole('button', { name: 'Change password' }).click()
    await page.getByText(/too easy to guess/).waitFor()
    await screenshot(page, 'account-password-weak')
    await page.getByLabel('New password', { exact: true }).fill('saffron glider orchard 27')
    await page.getByLabel('New password again').fill('saffron glider orchard 27')
    await page.getByRole('button', { name: 'Change password' }).click()
    await page.getByText('Password changed').waitFor()
  })

  it('the forgotten-password and reset screens', async () => {
    const { page } = browser
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(/\/signin/)
    await page.getByRole('link', { name: 'Forgot your password?' }).click()
    // the reset view is loaded on demand and the sign-in view (with its own E-mail field)
    // stays until it is; filling before would type into the sign-in form
    await page.getByRole('heading', { name: 'Reset your password' }).waitFor()
    await page.getByLabel('E-mail').fill('engineer@demo.flexshelf.test')
    await page.getByRole('button', { name: 'Send the link' }).click()
    await page.getByText('an e-mail with a link is on its way').waitFor()
    await screenshot(page, 'password-forgot-sent')
    await page.goto(`${app}/reset-password?token=not-a-real-token-at-all`)
    await page.getByLabel('New password', { exact: true }).fill('saffron glider orchard 28')
    await page.getByLabel('New password again').fill('saffron glider orchard 28')
    await page.getByRole('button', { name: 'Set the new password' }).click()
    await page.getByText('This link is not valid any more').waitFor()
    await screenshot(page, 'password-reset-invalid')
  })
})
