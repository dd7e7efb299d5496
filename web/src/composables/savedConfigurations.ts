/** Small helpers for saved configurations: how dates and fallback file names are written. */
import type { SavedConfiguration } from '@/api/configure'

/** "3 Dec 2026, 14:05" in the viewer's time zone; the ISO text when it is not a date. */
export function formatDate(iso: string): string {
  const d = new Date(iso)
  if (Number.isNaN(d.getTime())) return iso
  return d.toLocaleString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' })
}

/** A file-system-safe name (a–z, 0–9, '-') for a download the server did not name. */
export function slugName(text: string, max = 48): string {
  const slug = text.normalize('NFKD').replace(/[\u0300-\u036f]/g, '').toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '')
  return (slug.slice(0, max).replace(/-+$/, '') || 'part')
}

/** The link a colleague opens for a shared configuration. */
export function shareUrl(origin: string, token: string): string {
  return `${origin.replace(/\/+$/, '')}/shared/${encodeURIComponent(token)}`
}

/** What the list says about a configuration's entry: moved on, retired, or nothing. */
export function entryState(c: Pick<SavedConfiguration, 'revisionChanged' | 'entry'>): Array<'moved-on' | 'retired'> {
  const out: Array<'moved-on' | 'retired'> = []
  if (c.revisionChanged) out.push('moved-on')
  if (c.entry.status === 'retired') out.push('retired')
  return out
}
