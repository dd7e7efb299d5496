/**
 * The comparison as one A4 landscape PDF page (pdfkit, vector): the candidates' curves
 * overlaid with their tolerance bands, the metrics side by side with the best of each row
 * marked, printability side by side, and the cautions.
 */
import PDFDocument from 'pdfkit'
import type { Comparison } from './comparison'
import { fontBuffers } from './datasheet-text'

const INK = '#1D2428'
const MUTED = '#535F67'
const LINE = '#D8D7CF'
const WINDOW = '#0B6E5A'
/** One colour per candidate (the web app's compare palette). */
const CANDIDATE_COLOURS = ['#2F6690', '#B5542A', '#5B7F2A', '#7A4C8F']

const fmt = (v: number | boolean | null | undefined) => {
  if (v === null || v === undefined) return '–'
  if (typeof v === 'boolean') return v ? 'yes' : 'no'
  const t = String(Number(v.toPrecision(4)))
  return t.startsWith('-') ? `−${t.slice(1)}` : t
}

export function renderComparisonPdf(comparison: Comparison, options: { compress?: boolean } = {}): Promise<Buffer> {
  const doc = new PDFDocument({ size: 'A4', layout: 'landscape', margin: 36, compress: options.compress ?? true, info: { Title: 'Flexshelf comparison', Creator: 'Flexshelf' } })
  const fonts = fontBuffers()
  doc.registerFont('regular', fonts.regular)
  doc.registerFont('semibold', fonts.semibold)
  const chunks: Buffer[] = []
  doc.on('data', (c: Buffer) => chunks.push(c))
  const done = new Promise<Buffer>((resolve) => doc.on('end', () => resolve(Buffer.concat(chunks))))
  const { candidates, metrics, printability, cautions } = comparison
  const W = doc.page.width
  doc.font('semibold').fontSize(15).fillColor(INK).text(`Comparison of ${candidates.length} candidate${candidates.length === 1 ? '' : 's'}`, 36, 32)
  doc.font('regular').fontSize(8).fillColor(MUTED).text(`Flexshelf · ${new Date().toISOString().slice(0, 10)} · estimates to be confirmed on printed parts`, 36, 52)

  // curves: displacement against force, each candidate's band shaded and its nominal line; one
  // plot per axis pair, so a hinge (degrees, N·mm) is never drawn on a switch's mm and N
  const area = { x: 66, y: 76, w: 300, h: 190 }
  const groups = new Map<string, number[]>()
  candidates.forEach((c, i) => {
    const a = c.check.evaluation.curve.axes
    const key = `${a.displacement.label}|${a.displacement.unit}|${a.force.label}|${a.force.unit}`
    groups.set(key, [...(groups.get(key) ?? []), i])
  })
  const gap = 30
  const plotH = (area.h - gap * (groups.size - 1)) / groups.size
  let plotBottom = area.y
  ;[...groups.values()].forEach((members, g) => {
    const plot = { x: area.x, y: area.y + g * (plotH + gap), w: area.w, h: plotH }
    let xMax = 0, yMin = 0, yMax = 0
    for (const i of members) {
      const c = candidates[i]
      xMax = Math.max(xMax, ...c.check.band.curve.displacement)
      yMax = Math.max(yMax, ...c.check.band.curve.high, ...c.check.evaluation.curve.force)
      yMin = Math.min(yMin, ...c.check.band.curve.low, ...c.check.evaluation.curve.force)
    }
    if (!(xMax > 0)) xMax = 1
    if (!(yMax > yMin)) yMax = yMin + 1
    const px = (x: number) => plot.x + (x / xMax) * plot.w
    const py = (y: number) => plot.y + plot.h - ((y - yMin) / (yMax - yMin)) * plot.h
    doc.lineWidth(0.5).strokeColor(LINE).rect(plot.x, plot.y, plot.w, plot.h).stroke()
    if (yMin < 0) doc.moveTo(plot.x, py(0)).lineTo(plot.x + plot.w, py(0)).stroke()
    for (const i of members) {
      const c = candidates[i]
      const colour = CANDIDATE_COLOURS[i % CANDIDATE_COLOURS.length]
      const { displacement: d, low, high } = c.check.band.curve
      if (d.length > 1) {
        doc.moveTo(px(d[0]), py(high[0]))
        for (let k = 1; k < d.length; k++) doc.lineTo(px(d[k]), py(high[k]))
        for (let k = d.length - 1; k >= 0; k--) doc.lineTo(px(d[k]), py(low[k]))
        doc.closePath().fillOpacity(0.14).fill(colour).fillOpacity(1)
      }
      const curve = c.check.evaluation.curve
      doc.moveTo(px(curve.displacement[0]), py(curve.force[0]))
      for (let k = 1; k < curve.displacement.length; k++) doc.lineTo(px(curve.displacement[k]), py(curve.force[k]))
      doc.lineWidth(1.2).strokeColor(colour).stroke()
    }
    const axes = candidates[members[0]].check.evaluation.curve.axes
    doc.font('regular').fontSize(7).fillColor(MUTED)
    doc.text(`${fmt(yMax)}`, plot.x - 28, plot.y - 3, { width: 24, align: 'right' })
    doc.text(`${fmt(yMin)}`, plot.x - 28, plot.y + plot.h - 4, { width: 24, align: 'right' })
    doc.text(`0`, plot.x - 2, plot.y + plot.h + 3)
    doc.text(`${fmt(xMax)}`, plot.x + plot.w - 30, plot.y + plot.h + 3, { width: 30, align: 'right' })
    const which = groups.size > 1 ? ` · candidates ${members.map((i) => i + 1).join(', ')}` : ''
    doc.text(`${axes.displacement.label} (${axes.displacement.unit}) across · ${axes.force.label} (${axes.force.unit}) up · bands: manufacturing tolerance${which}`, plot.x, plot.y + plot.h + 12, { width: plot.w })
    plotBottom = plot.y + plot.h
  })

  // legend and parameters
  let y = 76
  const lx = 390
  candidates.forEach((c, i) => {
    const colour = CANDIDATE_COLOURS[i % CANDIDATE_COLOURS.length]
    doc.rect(lx, y + 2, 9, 9).fill(colour)
    doc.font('semibold').fontSize(9).fillColor(INK).text(`${i + 1}. ${c.label}`, lx + 14, y, { width: W - lx - 50 })
    y = doc.y
    const params = Object.entries(c.check.evaluation.params).map(([k, v]) => `${k} ${v}`).join(', ')
    doc.font('regular').fontSize(7.5).fillColor(MUTED).text(`${c.check.entry.familyName}, revision ${c.check.entry.revision?.number ?? '–'} · ${params}`, lx + 14, y, { width: W - lx - 50 })
    y = doc.y + 6
  })

  // metrics table
  y = Math.max(y, plotBottom + 34)
  const col0 = 170
  const colW = (W - 72 - col0) / candidates.length
  // one page whatever the family: a longer metrics list is set smaller (8 pt down to 6.5 pt)
  const rows = 1 + metrics.length + printability.length
  const size = Math.max(6.5, Math.min(8, (doc.page.height - 36 - 40 - y) / rows / 1.75))
  const row = (label: string, cells: string[], bold: number | null, head = false) => {
    doc.font(head ? 'semibold' : 'regular').fontSize(size).fillColor(INK).text(label, 36, y, { width: col0 - 6 })
    cells.forEach((text, i) => {
      doc.font(i === bold || head ? 'semibold' : 'regular').fillColor(i === bold ? WINDOW : INK).text(text, 36 + col0 + i * colW, y, { width: colW - 6 })
    })
    y = Math.max(doc.y, y + size * 1.35) + 2
    doc.lineWidth(0.3).strokeColor(LINE).moveTo(36, y - 1).lineTo(W - 36, y - 1).stroke()
  }
  row('Metric (best marked)', candidates.map((c, i) => `${i + 1}. ${c.label}`), null, true)
  for (const m of metrics) {
    const unit = m.unit && m.unit !== 'boolean' ? ` ${m.unit}` : ''
    row(`${m.label}${m.better ? ` (${m.better} is better)` : ''}`, m.values.map((v, i) => {
      const b = m.bands[i]
      // a figure the candidate's family does not give is a dash alone, without the row's unit
      if (v === null || v === undefined) return '–'
      return `${fmt(v)}${unit}${b ? ` (band ${fmt(b[0])} to ${fmt(b[1])})` : ''}${m.best === i ? '  (best)' : ''}`
    }), m.best)
  }
  for (const p of printability) row(`Printability: ${p.label}`, p.levels.map((l) => l ?? 'not checked'), null)
  y += 6
  doc.font('regular').fontSize(7.5).fillColor(MUTED).text(cautions.join(' '), 36, y, { width: W - 72 })
  doc.end()
  return done
}
