/**
 * The configure routes (issue 5): checking a configuration against its entry, the files it
 * downloads and the engineer's saved configurations. Shapes follow api/services/configure.ts,
 * datasheet.ts and docs/api.md; the catalog's own types are shared where the server sends them.
 */
import type { z } from 'zod'
import type * as contract from '@contract/api'
import { ApiError, parseErrorBody, request } from './client'
import type { ForceWindow } from '@catalog/window'
import type { PrintabilityReport } from '@catalog/printability'

export type { PrintabilityReport }

// The answers' shapes come from the wire contract (contract/api.ts), type-only.
export type ToleranceSetting = z.infer<typeof contract.ToleranceSetting>
export type PrinterSetting = z.infer<typeof contract.PrinterSetting>
export type CheckResult = z.infer<typeof contract.CheckResult>
export type WindowOverlay = z.infer<typeof contract.WindowOverlay>
export type Datasheet = z.infer<typeof contract.Datasheet>
export type SavedConfiguration = z.infer<typeof contract.SavedConfiguration>

/** What an engineer configures against an entry; the body of the check and save routes. */
export interface Configuration {
  params: Record<string, number | string>
  method?: string
  window?: ForceWindow | null
  tolerance?: ToleranceSetting | null
  printer?: PrinterSetting | null
}

/** The query of a download or data-sheet link: JSON fields URL-encoded, `method` as text. */
export function configurationQuery(config: Configuration): string {
  const q = new URLSearchParams()
  q.set('params', JSON.stringify(config.params))
  if (config.window) q.set('window', JSON.stringify(config.window))
  if (config.tolerance) q.set('tolerance', JSON.stringify(config.tolerance))
  if (config.printer) q.set('printer', JSON.stringify(config.printer))
  if (config.method) q.set('method', config.method)
  return q.toString()
}

const entryPath = (id: number | string) => `/api/entries/${encodeURIComponent(String(id))}`

export const configureApi = {
  check: (entryId: number | string, body: Configuration, signal?: AbortSignal) =>
    request<CheckResult>('POST', `${entryPath(entryId)}/check`, { body, signal }),
  datasheet: (entryId: number | string, config: Configuration, signal?: AbortSignal) =>
    request<{ datasheet: Datasheet }>('GET', `${entryPath(entryId)}/datasheet?${configurationQuery(config)}`, { signal }).then((r) => r.datasheet),
  stlPath: (entryId: number | string, config: Configuration) => `${entryPath(entryId)}/stl?${configurationQuery(config)}`,
  csvPath: (entryId: number | string, config: Configuration) => `${entryPath(entryId)}/curve.csv?${configurationQuery(config)}`,
  pdfPath: (entryId: number | string, config: Configuration) => `${entryPath(entryId)}/datasheet.pdf?${configurationQuery(config)}`,
}

export interface SaveBody extends Configuration {
  name: string
  entryId: number
}

type One = { configuration: SavedConfiguration }

/**
 * A saved or shared configuration's own read routes (check, files, data sheet): they use what
 * was saved, under the ranges of the revision it was saved from, so a retired or narrowed
 * entry still answers.
 */
export interface SavedTarget {
  kind: 'saved' | 'shared'
  /** The configuration id, or the share token. */
  key: string
}

const savedBase = (t: SavedTarget) => (t.kind === 'saved' ? `/api/configurations/${encodeURIComponent(t.key)}` : `/api/shared/${encodeURIComponent(t.key)}`)

export const configurationsApi = {
  list: () => request<{ configurations: SavedConfiguration[] }>('GET', '/api/configurations').then((r) => r.configurations),
  show: (id: number | string) => request<One>('GET', `/api/configurations/${encodeURIComponent(String(id))}`).then((r) => r.configuration),
  create: (body: SaveBody) => request<One>('POST', '/api/configurations', { body }).then((r) => r.configuration),
  remove: (id: number) => request<void>('DELETE', `/api/configurations/${id}`),
  share: (id: number) => request<{ shareToken: string; url: string }>('POST', `/api/configurations/${id}/share`),
  unshare: (id: number) => request<void>('DELETE', `/api/configurations/${id}/share`),
  shared: (token: string) => request<One>('GET', `/api/shared/${encodeURIComponent(token)}`).then((r) => r.configuration),
  check: (t: SavedTarget, signal?: AbortSignal) => request<CheckResult>('GET', `${savedBase(t)}/check`, { signal }),
  datasheet: (t: SavedTarget, signal?: AbortSignal) => request<{ datasheet: Datasheet }>('GET', `${savedBase(t)}/datasheet`, { signal }).then((r) => r.datasheet),
  stlPath: (t: SavedTarget) => `${savedBase(t)}/stl`,
  csvPath: (t: SavedTarget) => `${savedBase(t)}/curve.csv`,
  pdfPath: (t: SavedTarget) => `${savedBase(t)}/datasheet.pdf`,
}

export interface DownloadedFile {
  blob: Blob
  fileName: string
  notices: string[]
}

/** Fetches a file with the bearer token (a plain link cannot send it) and reads its file name. */
export async function fetchFile(path: string, token: string | null, fallbackName: string): Promise<DownloadedFile> {
  let response: Response
  try {
    response = await fetch(path, { headers: token ? { Authorization: `Bearer ${token}` } : {} })
  } catch {
    throw new ApiError(0, 'network', 'The server cannot be reached. Check the connection and try again.')
  }
  if (!response.ok) throw parseErrorBody(response.status, await response.text())
  const notice = response.headers.get('Flexshelf-Notice')
  return {
    blob: await response.blob(),
    fileName: fileNameFromDisposition(response.headers.get('Content-Disposition'), fallbackName),
    // several notices are joined by ' | ' (docs/api.md)
    notices: notice ? safeDecode(notice).split(' | ').filter(Boolean) : [],
  }
}

function safeDecode(text: string): string {
  try {
    return decodeURIComponent(text)
  } catch {
    return text
  }
}

/**
 * The file name a Content-Disposition header gives (RFC 6266: `filename*` with its charset
 * wins over `filename`), reduced to a safe base name; the fallback when there is none.
 */
export function fileNameFromDisposition(header: string | null, fallback: string): string {
  if (!header) return fallback
  let name: string | null = null
  const extended = /filename\*\s*=\s*([^']*)'[^']*'([^;]+)/i.exec(header)
  if (extended) name = safeDecode(extended[2].trim().replace(/^"|"$/g, ''))
  if (!name) {
    const quoted = /filename\s*=\s*"((?:[^"\\]|\\.)*)"/i.exec(header)
    const bare = /filename\s*=\s*([^;"\s]+)/i.exec(header)
    name = quoted ? quoted[1].replace(/\\(.)/g, '$1') : bare ? bare[1] : null
  }
  if (!name) return fallback
  // no folders, no control characters: the browser saves it as one file in its download folder
  const base = name.split(/[\\/]/).pop()!.replace(/[\u0000-\u001f\u007f]/g, '').trim()
  return base && base !== '.' && base !== '..' ? base : fallback
}
