/**
 * Every main view of the web app with a real URL on the demo data, for the checks that walk
 * them all (content security policy, accessibility). Ids come from the API as the admin sees
 * it, so the list follows the demo shelf; a view whose record does not exist yet (nothing in
 * review) is left out and named in `skipped`.
 */
import type { Page } from 'playwright-core'

export interface AppView {
  name: string
  path: string
}

async function api<T>(baseUrl: string, token: string, path: string, init: RequestInit = {}): Promise<T> {
  const res = await fetch(`${baseUrl}/api${path}`, { ...init, headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json', ...(init.headers ?? {}) } })
  if (!res.ok) throw new Error(`${init.method ?? 'GET'} /api${path} answered ${res.status}: ${await res.text()}`)
  return (await res.json()) as T
}

export async function apiSignIn(baseUrl: string, email: string, password = 'flexshelf-demo'): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/signin`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) })
  if (!res.ok) throw new Error(`sign-in as ${email} answered ${res.status}`)
  return ((await res.json()) as { token: string }).token
}

/** The signed-in views an admin can open, plus the public ones (sign-in is checked signed out). */
export async function mainViews(baseUrl: string): Promise<{ views: AppView[]; skipped: string[] }> {
  const token = await apiSignIn(baseUrl, 'admin@demo.flexshelf.test')
  const { entries } = await api<{ entries: Array<{ id: number; familyId: string; status: string }> }>(baseUrl, token, '/entries')
  const released = entries.find((e) => e.status === 'released' && e.familyId === 'bistable-beam') ?? entries.find((e) => e.status === 'released')
  if (!released) throw new Error('the demo shelf has no released entry')
  const views: AppView[] = [
    { name: 'shelf', path: '/' },
    { name: 'search', path: '/search' },
    { name: 'entry', path: `/entries/${released.id}` },
    { name: 'configure', path: `/entries/${released.id}/configure` },
    { name: 'datasheet', path: `/entries/${released.id}/datasheet` },
    { name: 'configurations', path: '/configurations' },
    { name: 'propose', path: '/propose' },
    { name: 'propose-change', path: `/entries/${released.id}/propose` },
    { name: 'proposals', path: '/proposals' },
    { name: 'review', path: '/review' },
    { name: 'admin-users', path: '/admin/users' },
    { name: 'admin-outbox', path: '/admin/outbox' },
    { name: 'not-found', path: '/no/such/page' },
  ]
  const skipped: string[] = []
  // a shared configuration of the admin's own, so the read-only view has something to show
  try {
    const saved = await api<{ configuration: { id: number } }>(baseUrl, token, '/configurations', {
      method: 'POST', body: JSON.stringify({ entryId: released.id, name: 'Walk of every view', params: {} }),
    })
    const share = await api<{ shareToken: string }>(baseUrl, token, `/configurations/${saved.configuration.id}/share`, { method: 'POST' })
    views.push({ name: 'shared', path: `/shared/${share.shareToken}` })
  } catch (err) {
    skipped.push(`shared (${(err as Error).message})`)
  }
  try {
    const queue = await api<{ entries: Array<{ entry: { id: number } }> }>(baseUrl, token, '/review-queue')
    if (queue.entries.length) views.push({ name: 'review-entry', path: `/review/${queue.entries[0].entry.id}` })
    else skipped.push('review-entry (nothing in review on the demo shelf)')
  } catch (err) {
    skipped.push(`review-entry (${(err as Error).message})`)
  }
  return { views, skipped }
}

/** Opens a view and waits until its data has arrived and its lazy parts have rendered. */
export async function openView(page: Page, baseUrl: string, view: AppView): Promise<void> {
  await page.goto(`${baseUrl}${view.path}`)
  await page.waitForLoadState('networkidle')
  await page.locator('main, [role="main"]').first().waitFor({ timeout: 15_000 }).catch(() => undefined)
  // charts, the 3D preview and the design map's worker start after the first paint
  await page.waitForTimeout(600)
  await page.waitForLoadState('networkidle')
}
