/**
 * SVG drawing of the planar profile for documents: the outline at 1 : 1 (width and height in
 * mm, so it prints to scale), the overall length and height dimensioned, the extrusion depth
 * and the parameters written beneath.
 */
import { profileOf } from './profile'
import { escapeXml, type PartMetadata } from './threemf'

const num = (v: number) => String(Number(v.toFixed(2)))
const coord = (v: number) => String(Number(v.toFixed(4)))

export interface ProfileSvgOptions {
  /** Labels and units of the parameters listed under the drawing (key → "Span (mm)"). */
  labels?: Record<string, string>
}

export function serializeProfileSvg(solid: unknown, meta: PartMetadata, options: ProfileSvgOptions = {}): string {
  const { loops, depth, box } = profileOf(solid)
  const w = box.maxX - box.minX
  const h = box.maxY - box.minY
  const size = Math.max(w, h)
  // text and dimension spacing scale with the part, so a 10 mm hinge and a 90 mm frame read alike
  const font = Math.max(1.6, size / 28)
  const gap = font * 2.2
  const params = Object.entries(meta.params).filter(([k]) => k !== 'material')
  const listLines = [
    `Extrusion depth ${num(depth)} mm (along Z)`,
    `Parameters: ${params.map(([k, v]) => `${options.labels?.[k] ?? k} ${v}`).join(', ')}`,
    ...(meta.material ? [`Material ${meta.material}`] : []),
    'Estimates to be confirmed on printed parts.',
  ]
  const left = box.minX - gap * 2
  const top = -box.maxY - gap * 1.5 - font * 1.5
  const right = box.maxX + gap * 2.5
  const bottom = -box.minY + gap * 1.8 + (listLines.length + 0.6) * font * 1.5
  const vw = right - left
  const vh = bottom - top
  // y grows downwards in SVG: draw y as −y so the profile reads as in the bending plane
  const path = loops.map((loop) => `M${loop.map(([x, y]) => `${coord(x)},${coord(-y)}`).join('L')}Z`).join('')
  const stroke = font / 8
  const arrow = (x1: number, y1: number, x2: number, y2: number) =>
    `<line x1="${coord(x1)}" y1="${coord(y1)}" x2="${coord(x2)}" y2="${coord(y2)}" marker-start="url(#arrow)" marker-end="url(#arrow)"/>`
  const dimY = -box.minY + gap
  const dimX = box.maxX + gap
  const out = [
    '<?xml version="1.0" encoding="UTF-8"?>',
    `<svg xmlns="http://www.w3.org/2000/svg" width="${num(vw)}mm" height="${num(vh)}mm" viewBox="${coord(left)} ${coord(top)} ${coord(vw)} ${coord(vh)}" font-family="sans-serif" font-size="${coord(font)}">`,
    `  <title>${escapeXml(`${meta.name} — profile, mm`)}</title>`,
    `  <defs><marker id="arrow" viewBox="0 0 10 10" refX="5" refY="5" markerWidth="6" markerHeight="6" orient="auto-start-reverse"><path d="M0,2 L10,5 L0,8 z" fill="#333"/></marker></defs>`,
    `  <text x="${coord(box.minX)}" y="${coord(-box.maxY - gap * 1.2)}" font-weight="bold">${escapeXml(meta.name)} (${escapeXml(meta.family)}), mm</text>`,
    `  <path d="${path}" fill="#dfe7ef" fill-rule="evenodd" stroke="#1f3a5a" stroke-width="${coord(stroke)}"/>`,
    `  <g stroke="#333" stroke-width="${coord(stroke * 0.7)}" fill="none">`,
    `    <line x1="${coord(box.minX)}" y1="${coord(-box.minY + gap * 0.2)}" x2="${coord(box.minX)}" y2="${coord(dimY + gap * 0.3)}"/>`,
    `    <line x1="${coord(box.maxX)}" y1="${coord(-box.minY + gap * 0.2)}" x2="${coord(box.maxX)}" y2="${coord(dimY + gap * 0.3)}"/>`,
    `    ${arrow(box.minX, dimY, box.maxX, dimY)}`,
    `    <line x1="${coord(box.maxX + gap * 0.2)}" y1="${coord(-box.maxY)}" x2="${coord(dimX + gap * 0.3)}" y2="${coord(-box.maxY)}"/>`,
    `    <line x1="${coord(box.maxX + gap * 0.2)}" y1="${coord(-box.minY)}" x2="${coord(dimX + gap * 0.3)}" y2="${coord(-box.minY)}"/>`,
    `    ${arrow(dimX, -box.maxY, dimX, -box.minY)}`,
    '  </g>',
    `  <text class="dimension" data-dimension="length" x="${coord((box.minX + box.maxX) / 2)}" y="${coord(dimY - font * 0.4)}" text-anchor="middle">${num(w)}</text>`,
    `  <text class="dimension" data-dimension="height" x="${coord(dimX + font * 0.5)}" y="${coord(-(box.minY + box.maxY) / 2)}" dominant-baseline="middle">${num(h)}</text>`,
  ]
  listLines.forEach((line, i) => {
    out.push(`  <text x="${coord(left + gap * 0.5)}" y="${coord(dimY + gap * 0.9 + (i + 1) * font * 1.5)}" font-size="${coord(font * 0.85)}">${escapeXml(line)}</text>`)
  })
  out.push('</svg>', '')
  return out.join('\n')
}
