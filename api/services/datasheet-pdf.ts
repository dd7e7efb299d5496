/**
 * The data sheet as a PDF (pdfkit), drawn from the same sections as the printable page:
 * first the part (parameters, material, the curve with the force window and the tolerance
 * band), then the judgement (metrics, verdict, printability, method, warnings, cautions),
 * flowing onto as many A4 pages as it needs (two for a typical entry).
 * Vector drawing throughout, so the curve prints sharp at any size.
 */
import PDFDocument from 'pdfkit'
import type { Datasheet, WindowOverlay } from './datasheet'
import { fontBuffers, textRuns, type FontKey } from './datasheet-text'

type Doc = PDFKit.PDFDocument

// Flexshelf's light palette (the same values as web/src/theme/tokens.ts)
const INK = '#1D2428'
const MUTED = '#535F67'
const LINE = '#D8D7CF'
const SUNKEN = '#EEEDE7'
const SECONDARY = '#3C5566'
const WINDOW = '#0B6E5A'
const DANGER = '#A3302B'
const WARNING = '#7E5300'

const MARGIN = 50
const PAGE = { width: 595.28, height: 841.89 }
const CONTENT_WIDTH = PAGE.width - 2 * MARGIN

export interface PdfOptions {
  /** Deflate the content streams (the default); tests read the text of an uncompressed one. */
  compress?: boolean
}

const fmt = (v: number | null | undefined): string => {
  if (v === null || v === undefined || !Number.isFinite(v)) return '–'
  const text = String(Number(v.toPrecision(4)))
  return text.startsWith('-') ? `−${text.slice(1)}` : text
}
const withUnit = (v: string, unit: string) => (unit && unit !== 'boolean' ? `${v} ${unit}` : v)

interface WriteOptions extends PDFKit.Mixins.TextOptions {
  weight?: 'regular' | 'semibold'
  size?: number
  color?: string
}

/** Writes a line or paragraph in Plex, switching font file per script (see datasheet-text.ts). */
function write(doc: Doc, text: string, x: number | undefined, y: number | undefined, options: WriteOptions = {}): void {
  const { weight = 'regular', size = 9, color = INK, ...textOptions } = options
  doc.fontSize(size).fillColor(color)
  const runs = textRuns(text, weight)
  if (!runs.length) runs.push({ font: weight, text: '' })
  runs.forEach((run, i) => {
    doc.font(run.font as FontKey)
    const opts = { ...textOptions, continued: i < runs.length - 1 }
    if (i === 0 && x !== undefined && y !== undefined) doc.text(run.text, x, y, opts)
    else doc.text(run.text, opts)
  })
}

/** A section title; `room` is what must fit under it on the same page (no orphaned titles). */
function heading(doc: Doc, text: string, room = 60): void {
  ensureRoom(doc, 30 + Math.min(room, 300))
  doc.moveDown(0.6)
  write(doc, text, MARGIN, doc.y, { weight: 'semibold', size: 11, color: SECONDARY })
  const y = doc.y + 1
  doc.moveTo(MARGIN, y).lineTo(MARGIN + CONTENT_WIDTH, y).lineWidth(0.5).strokeColor(LINE).stroke()
  doc.y = y + 4
}

function paragraph(doc: Doc, text: string, options: WriteOptions = {}): void {
  write(doc, text, MARGIN, doc.y, { width: CONTENT_WIDTH, ...options })
  doc.moveDown(0.25)
}

function bullet(doc: Doc, text: string, options: WriteOptions = {}): void {
  const y = doc.y
  write(doc, '•', MARGIN, y, { color: options.color ?? MUTED })
  write(doc, text, MARGIN + 10, y, { width: CONTENT_WIDTH - 10, ...options })
  doc.moveDown(0.2)
}

/** Starts a new page when fewer than `height` points are left above the footer. */
function ensureRoom(doc: Doc, height: number): void {
  if (doc.y + height > PAGE.height - MARGIN - 20) doc.addPage()
}

interface Column {
  title: string
  width: number
  align?: 'left' | 'right'
}

const ROW_HEIGHT = 12
const tableHeight = (rows: number) => ROW_HEIGHT * (rows + 1) + 6

function table(doc: Doc, columns: Column[], rows: string[][]): void {
  const rowHeight = ROW_HEIGHT
  const header = (y: number) => {
    let x = MARGIN
    for (const c of columns) {
      write(doc, c.title, x, y, { width: c.width - 6, align: c.align ?? 'left', weight: 'semibold', size: 8, color: MUTED, lineBreak: false })
      x += c.width
    }
  }
  // a short table is kept on one page; a long one breaks between rows, its header repeated
  const whole = tableHeight(rows.length)
  ensureRoom(doc, whole < 300 ? whole : rowHeight * 2)
  header(doc.y)
  let y = doc.y + 3
  for (const [r, row] of rows.entries()) {
    if (y + rowHeight > PAGE.height - MARGIN - 20) {
      doc.addPage()
      header(doc.y)
      y = doc.y + 3
    }
    if (r % 2 === 0) doc.rect(MARGIN, y - 2, CONTENT_WIDTH, rowHeight).fillColor(SUNKEN).fill()
    let x = MARGIN
    for (const [i, c] of columns.entries()) {
      write(doc, row[i] ?? '', x + 2, y, { width: c.width - 8, align: c.align ?? 'left', lineBreak: false, ellipsis: true })
      x += c.width
    }
    y += rowHeight
  }
  doc.x = MARGIN
  doc.y = y + 2
}

/** 1, 2 or 5 × 10ⁿ, about `count` steps across [lo, hi]. */
function niceStep(lo: number, hi: number, count = 6): number {
  const raw = Math.max((hi - lo) / count, 1e-9)
  const power = 10 ** Math.floor(Math.log10(raw))
  const mult = [1, 2, 5, 10].find((m) => m * power >= raw)!
  return mult * power
}

interface PlotBox {
  x: number
  y: number
  width: number
  height: number
}

function plotRanges(sheet: Datasheet) {
  const { curve } = sheet
  const xs = [0, ...curve.displacement]
  const ys = [0, ...curve.force, ...curve.band.curve.low, ...curve.band.curve.high]
  for (const w of curve.window) {
    if (w.kind === 'force-range') ys.push(...[w.min, w.max].filter((v): v is number => v !== null))
    if (w.kind === 'displacement-range') xs.push(...[w.min, w.max].filter((v): v is number => v !== null))
  }
  let [x0, x1] = [Math.min(...xs), Math.max(...xs)]
  let [y0, y1] = [Math.min(...ys), Math.max(...ys)]
  if (x1 - x0 < 1e-9) x1 = x0 + 1
  if (y1 - y0 < 1e-9) y1 = y0 + 1
  const padY = (y1 - y0) * 0.06
  y0 -= y0 < 0 ? padY : 0
  y1 += padY
  const xStep = niceStep(x0, x1)
  const yStep = niceStep(y0, y1)
  x0 = Math.floor(x0 / xStep) * xStep
  x1 = Math.ceil(x1 / xStep) * xStep
  y0 = Math.floor(y0 / yStep) * yStep
  y1 = Math.ceil(y1 / yStep) * yStep
  return { x0, x1, y0, y1, xStep, yStep }
}

function drawWindow(doc: Doc, w: WindowOverlay, px: (v: number) => number, py: (v: number) => number, r: ReturnType<typeof plotRanges>): void {
  doc.save()
  if (w.kind === 'force-range') {
    const top = py(w.max ?? r.y1)
    const bottom = py(w.min ?? r.y0)
    doc.rect(px(r.x0), top, px(r.x1) - px(r.x0), bottom - top).fillOpacity(0.13).fillColor(WINDOW).fill()
    doc.fillOpacity(1)
    for (const v of [w.min, w.max]) if (v !== null) doc.moveTo(px(r.x0), py(v)).lineTo(px(r.x1), py(v)).dash(4, { space: 3 }).lineWidth(0.8).strokeColor(WINDOW).stroke()
  } else if (w.kind === 'displacement-range') {
    for (const v of [w.min, w.max]) if (v !== null) doc.moveTo(px(v), py(r.y0)).lineTo(px(v), py(r.y1)).dash(4, { space: 3 }).lineWidth(0.8).strokeColor(WINDOW).stroke()
  } else {
    // an open side reaches the axis (no minimum) or twice the steepest slope the plot shows (no maximum)
    const lo = w.min ?? 0
    const hi = w.max ?? (2 * r.y1) / Math.max(r.x1, 1e-9)
    doc.polygon([px(0), py(0)], [px(r.x1), py(lo * r.x1)], [px(r.x1), py(hi * r.x1)]).fillOpacity(0.13).fillColor(WINDOW).fill()
    doc.fillOpacity(1)
    for (const k of [w.min, w.max]) if (k !== null) doc.moveTo(px(0), py(0)).lineTo(px(r.x1), py(k * r.x1)).dash(4, { space: 3 }).lineWidth(0.8).strokeColor(WINDOW).stroke()
  }
  doc.undash().restore()
}

/** The curve: tolerance band shaded, the force window in the accent colour, positions marked. */
function drawCurve(doc: Doc, sheet: Datasheet, box: PlotBox): void {
  const r = plotRanges(sheet)
  const px = (v: number) => box.x + ((v - r.x0) / (r.x1 - r.x0)) * box.width
  const py = (v: number) => box.y + box.height - ((v - r.y0) / (r.y1 - r.y0)) * box.height
  const { curve } = sheet

  doc.rect(box.x, box.y, box.width, box.height).fillColor('#FFFFFF').fill()
  doc.lineWidth(0.4).strokeColor(LINE)
  for (let v = r.x0; v <= r.x1 + r.xStep / 2; v += r.xStep) {
    doc.moveTo(px(v), box.y).lineTo(px(v), box.y + box.height).stroke()
    write(doc, fmt(v), px(v) - 20, box.y + box.height + 3, { width: 40, align: 'center', size: 7, color: MUTED, lineBreak: false })
  }
  for (let v = r.y0; v <= r.y1 + r.yStep / 2; v += r.yStep) {
    doc.moveTo(box.x, py(v)).lineTo(box.x + box.width, py(v)).stroke()
    write(doc, fmt(v), box.x - 44, py(v) - 4, { width: 40, align: 'right', size: 7, color: MUTED, lineBreak: false })
  }
  // the zero-force line: where a bistable part's positions sit
  if (r.y0 < 0 && r.y1 > 0) doc.moveTo(box.x, py(0)).lineTo(box.x + box.width, py(0)).lineWidth(0.8).strokeColor(MUTED).stroke()

  doc.save()
  doc.rect(box.x, box.y, box.width, box.height).clip()
  for (const w of curve.window) drawWindow(doc, w, px, py, r)
  const band = curve.band.curve
  if (band.displacement.length > 1) {
    const points = [
      ...band.displacement.map((d, i) => [px(d), py(band.high[i])]),
      ...band.displacement.map((d, i) => [px(d), py(band.low[i])]).reverse(),
    ]
    doc.polygon(...points).fillOpacity(0.28).fillColor(SECONDARY).fill()
    doc.fillOpacity(1)
  }
  if (curve.displacement.length > 0) {
    doc.moveTo(px(curve.displacement[0]), py(curve.force[0]))
    for (let i = 1; i < curve.displacement.length; i++) doc.lineTo(px(curve.displacement[i]), py(curve.force[i]))
    doc.lineWidth(1.4).lineJoin('round').strokeColor(INK).stroke()
  }
  for (const m of curve.markers) {
    doc.circle(px(m.displacement), py(m.force), 3.2).lineWidth(1.2)
    if (m.kind === 'stable') doc.fillColor(INK).fillAndStroke(INK, INK)
    else doc.fillColor('#FFFFFF').fillAndStroke('#FFFFFF', INK)
  }
  doc.restore()
  doc.rect(box.x, box.y, box.width, box.height).lineWidth(0.6).strokeColor(MUTED).stroke()

  const { displacement: dAxis, force: fAxis } = curve.axes
  write(doc, withUnit(dAxis.label, dAxis.unit ? `(${dAxis.unit})` : ''), box.x, box.y + box.height + 14, { width: box.width, align: 'center', size: 8, color: MUTED })
  doc.save()
  doc.rotate(-90, { origin: [box.x - 50, box.y + box.height / 2] })
  write(doc, withUnit(fAxis.label, fAxis.unit ? `(${fAxis.unit})` : ''), box.x - 50 - box.height / 2, box.y + box.height / 2 - 4, { width: box.height, align: 'center', size: 8, color: MUTED })
  doc.restore()
}

function legend(doc: Doc, sheet: Datasheet, y: number): number {
  const { band, window, markers } = sheet.curve
  const t = band.tolerance
  const items: Array<{ draw: (x: number, y: number) => void; label: string }> = [
    { draw: (x, yy) => { doc.moveTo(x, yy + 4).lineTo(x + 14, yy + 4).lineWidth(1.4).strokeColor(INK).stroke() }, label: 'Predicted curve (nominal)' },
    {
      draw: (x, yy) => { doc.rect(x, yy, 14, 8).fillOpacity(0.28).fillColor(SECONDARY).fill(); doc.fillOpacity(1) },
      label: `Tolerance band: walls ±${fmt(t.thickness)} mm, modulus ±${fmt(t.modulus * 100)} %${band.defaulted ? ' (common-practice default)' : ''}`,
    },
  ]
  if (window.length) items.push({ draw: (x, yy) => { doc.rect(x, yy, 14, 8).fillOpacity(0.13).fillColor(WINDOW).fill(); doc.fillOpacity(1); doc.rect(x, yy, 14, 8).lineWidth(0.6).strokeColor(WINDOW).stroke() }, label: 'Force window' })
  if (markers.some((m) => m.kind === 'stable')) items.push({ draw: (x, yy) => { doc.circle(x + 7, yy + 4, 3).fillAndStroke(INK, INK) }, label: 'Stable position' })
  if (markers.some((m) => m.kind === 'unstable')) items.push({ draw: (x, yy) => { doc.circle(x + 7, yy + 4, 3).lineWidth(1.2).fillAndStroke('#FFFFFF', INK) }, label: 'Unstable position' })
  // the first two items (curve and band) on the left, the rest on the right
  const column = CONTENT_WIDTH / 2
  let left = y
  let right = y
  for (const [i, item] of items.entries()) {
    const x = i < 2 ? MARGIN : MARGIN + column
    const at = i < 2 ? left : right
    item.draw(x, at)
    write(doc, item.label, x + 20, at, { size: 8, color: MUTED, width: column - 24 })
    if (i < 2) left = Math.max(doc.y, at + 11)
    else right = Math.max(doc.y, at + 11)
  }
  let yy = Math.max(left, right) + 2
  for (const w of window) {
    write(doc, `Window: ${w.label}`, MARGIN + 20, yy, { size: 8, color: WINDOW, width: CONTENT_WIDTH - 20 })
    yy = Math.max(doc.y, yy + 11)
  }
  doc.x = MARGIN
  doc.y = yy
  return yy
}

const VERDICT_WORDS = { inside: 'inside the window', edge: 'at the edge of the window', outside: 'outside the window' } as const

/** The part: what it is, its parameters and material, its curve. */
function thePart(doc: Doc, sheet: Datasheet): void {
  write(doc, 'FLEXSHELF DATA SHEET', MARGIN, MARGIN, { size: 8, weight: 'semibold', color: MUTED, characterSpacing: 1 })
  write(doc, sheet.entry.name, MARGIN, doc.y + 2, { size: 18, weight: 'semibold', width: CONTENT_WIDTH })
  const revision = sheet.entry.revision ? `revision ${sheet.entry.revision.number}` : 'no released revision'
  const configuration = sheet.configuration ? ` · saved as "${sheet.configuration.name}"` : ''
  write(doc, `${sheet.family.name} (${sheet.family.id}) · ${revision} · ${sheet.entry.status}${configuration} · ${sheet.date}`, MARGIN, doc.y + 2, { size: 9, color: MUTED, width: CONTENT_WIDTH })
  if (sheet.entry.summary) write(doc, sheet.entry.summary, MARGIN, doc.y + 4, { size: 9, width: CONTENT_WIDTH })
  for (const notice of sheet.notices) write(doc, notice, MARGIN, doc.y + 4, { size: 9, color: WARNING, width: CONTENT_WIDTH })

  // two parameters a row, so the curve and the metrics share the first page
  const half = Math.ceil(sheet.parameters.length / 2)
  const cells = (p: Datasheet['parameters'][number] | undefined) => (p ? [p.label, fmt(p.value), p.unit] : ['', '', ''])
  heading(doc, 'Parameters', tableHeight(half))
  table(doc, [
    { title: 'Parameter', width: 150 }, { title: 'Value', width: 55, align: 'right' }, { title: 'Unit', width: 43 },
    { title: 'Parameter', width: 150 }, { title: 'Value', width: 55, align: 'right' }, { title: 'Unit', width: 42 },
  ], Array.from({ length: half }, (_, i) => [...cells(sheet.parameters[i]), ...cells(sheet.parameters[half + i])]))

  heading(doc, 'Material', 30)
  const m = sheet.material
  paragraph(doc, `${m.name}${m.id ? ` (${m.id})` : ''}: modulus ${fmt(m.modulus)} MPa, Poisson\u2019s ratio ${fmt(m.poissonRatio)}, strain limit ${fmt(m.strainLimit * 100)} %.`)
  paragraph(doc, `Source: ${m.source}`, { size: 8, color: MUTED })

  heading(doc, 'Predicted curve', 300)
  const box = { x: MARGIN + 52, y: doc.y + 6, width: CONTENT_WIDTH - 60, height: 200 }
  drawCurve(doc, sheet, box)
  legend(doc, sheet, box.y + box.height + 30)
}

/** The judgement; it flows on from the curve, onto a second page as it needs. */
function judgement(doc: Doc, sheet: Datasheet): void {
  heading(doc, 'Metrics', tableHeight(sheet.metrics.length))
  const t = sheet.curve.band.tolerance
  table(doc, [{ title: 'Metric', width: 190 }, { title: 'Nominal', width: 85, align: 'right' }, { title: `Band (±${fmt(t.thickness)} mm, ±${fmt(t.modulus * 100)} %)`, width: 150, align: 'right' }, { title: 'Unit', width: 70 }],
    sheet.metrics.map((mt) => [
      mt.label,
      typeof mt.value === 'boolean' ? (mt.value ? 'yes' : 'no') : fmt(mt.value),
      mt.band ? `${fmt(mt.band[0])} … ${fmt(mt.band[1])}` : '–',
      mt.unit === 'boolean' ? '' : mt.unit,
    ]))
  paragraph(doc, `Part size ${fmt(sheet.envelope.x)} × ${fmt(sheet.envelope.y)} × ${fmt(sheet.envelope.z)} mm (along × across × print height). Strains are fractions (0.02 = 2 %).`, { size: 8, color: MUTED })

  heading(doc, 'Verdict', sheet.verdict ? tableHeight(sheet.verdict.band.constraints.length) + 20 : 20)
  if (!sheet.verdict) {
    paragraph(doc, 'No force window was given, so the configuration is not judged against one.', { color: MUTED })
  } else {
    const { nominal, band } = sheet.verdict
    paragraph(doc, `Nominal: ${VERDICT_WORDS[nominal.verdict]}. Whole tolerance band: ${VERDICT_WORDS[band.verdict]}.`, { weight: 'semibold', color: band.verdict === 'outside' || nominal.verdict === 'outside' ? DANGER : band.verdict === 'inside' ? WINDOW : WARNING })
    table(doc, [{ title: 'Requirement', width: 190 }, { title: 'Bound', width: 70, align: 'right' }, { title: 'Nominal', width: 70, align: 'right' }, { title: 'Band, worst', width: 75, align: 'right' }, { title: 'Verdict (band)', width: 90 }],
      band.constraints.map((c, i) => {
        const n = nominal.constraints[i]
        return [c.label, c.bound === null ? '' : withUnit(fmt(c.bound), c.unit), n?.value === null || n === undefined ? '–' : withUnit(fmt(n.value), c.unit), c.value === null ? '–' : withUnit(fmt(c.value), c.unit), c.verdict]
      }))
    if (band.strain) paragraph(doc, `Strain safety factor over the band: ${fmt(band.strain.safetyFactor)} (${band.strain.verdict}).`, { size: 8, color: MUTED })
  }

  heading(doc, `Printability on a ${fmt(sheet.printability.printer.nozzle)} mm nozzle at ${fmt(sheet.printability.printer.layer)} mm layers (common practice)`)
  for (const c of sheet.printability.checks) bullet(doc, `${c.level === 'ok' ? 'OK' : c.level === 'warn' ? 'Check' : 'Fails'}: ${c.message}`, { color: c.level === 'fail' ? DANGER : c.level === 'warn' ? WARNING : INK })
  // the general printing notes are set tight (they are the same for every part) so the
  // judgement, method, warnings and cautions keep to the second page
  for (const note of sheet.printability.notes) bullet(doc, note, { size: 7.5, color: MUTED, lineGap: -0.5 })
  paragraph(doc, `These printing rules are ${sheet.printability.basis}.`, { size: 8, color: MUTED })

  heading(doc, 'Method and source')
  paragraph(doc, `${sheet.method.label} (${sheet.method.id})`, { weight: 'semibold' })
  paragraph(doc, sheet.method.source, { size: 8 })
  if (sheet.method.bending) paragraph(doc, sheet.method.bending, { size: 8 })

  if (sheet.warnings.length) {
    heading(doc, 'Warnings')
    for (const w of sheet.warnings) bullet(doc, w, { color: WARNING })
  }
  if (sheet.curve.band.note) paragraph(doc, sheet.curve.band.note, { size: 8, color: MUTED })

  heading(doc, 'Cautions')
  for (const c of sheet.cautions) bullet(doc, c)
}

function footers(doc: Doc, sheet: Datasheet): void {
  const range = doc.bufferedPageRange()
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i)
    // the footer sits in the bottom margin; lift the margin so pdfkit does not break the page
    const bottom = doc.page.margins.bottom
    doc.page.margins.bottom = 0
    write(doc, `Flexshelf · ${sheet.entry.name} · generated ${sheet.date} · page ${i + 1} of ${range.count}`, MARGIN, PAGE.height - MARGIN + 14, { size: 7, color: MUTED, width: CONTENT_WIDTH, lineBreak: false })
    doc.page.margins.bottom = bottom
  }
}

/** The PDF bytes of a data sheet. */
export function renderDatasheetPdf(sheet: Datasheet, options: PdfOptions = {}): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4', margin: MARGIN, bufferPages: true, compress: options.compress ?? true,
    info: { Title: sheet.title, Author: 'Flexshelf', Subject: `${sheet.family.name}: ${sheet.entry.name}`, CreationDate: new Date(sheet.generatedAt) },
  })
  const fonts = fontBuffers()
  for (const [key, bytes] of Object.entries(fonts)) doc.registerFont(key, bytes)
  const chunks: Buffer[] = []
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (chunk: Buffer) => chunks.push(chunk))
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })
  thePart(doc, sheet)
  judgement(doc, sheet)
  footers(doc, sheet)
  doc.end()
  return done
}
