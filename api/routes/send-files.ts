/** Answers for downloads: attachment headers, the notices header, the data sheet both ways. */
import type { Response } from 'express'
import type { ConfigurationInput } from '../services/configuration-input'
import type { ConfigureTarget } from '../services/configure'
import { buildDatasheet, type DatasheetOptions } from '../services/datasheet'
import { renderDatasheetPdf } from '../services/datasheet-pdf'
import type { DownloadFile } from '../services/downloads'

/** Notices of a binary download travel in this header, joined by " | " (plain ASCII). */
const NOTICE_HEADER = 'Flexshelf-Notice'

function setNotices(res: Response, notices: string[]): void {
  if (!notices.length) return
  res.set(NOTICE_HEADER, notices.map((n) => n.replace(/[^\x20-\x7e]/g, '').replace(/\|/g, '/')).join(' | '))
}

function attach(res: Response, fileName: string, contentType: string, notices: string[]): void {
  // the file name is built from [a-z0-9.-] only (services/file-names.ts), so it needs no escaping
  res.set('Content-Disposition', `attachment; filename="${fileName}"`)
  res.set('Content-Type', contentType)
  // per-user downloads: browsers may keep them, shared caches may not
  res.set('Cache-Control', 'private, no-cache')
  setNotices(res, notices)
}

export function sendFile(res: Response, file: DownloadFile): void {
  attach(res, file.fileName, file.contentType, file.notices)
  res.send(file.body)
}

export async function sendDatasheet(res: Response, target: ConfigureTarget, input: ConfigurationInput, options: DatasheetOptions = {}): Promise<void> {
  res.json({ datasheet: await buildDatasheet(target, input, options) })
}

export async function sendDatasheetPdf(res: Response, target: ConfigureTarget, input: ConfigurationInput, options: DatasheetOptions = {}): Promise<void> {
  const sheet = await buildDatasheet(target, input, options)
  const pdf = await renderDatasheetPdf(sheet)
  attach(res, sheet.fileName, 'application/pdf', sheet.notices)
  res.send(pdf)
}
