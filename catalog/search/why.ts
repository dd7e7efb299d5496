/** Plain sentences: why a result ranks where it does. */
import { judge, quantitiesOf, type ForceWindow, type MetricBand, type WindowRange } from '../window'
import type { CandidateScore } from './candidate'
import type { Confirmation, SearchMaterial } from './types'

export const num = (v: number) => (Math.abs(v) >= 100 ? v.toFixed(0) : Number(v.toPrecision(3)).toString())
export const pct = (v: number) => `${Math.round(v * 100)} %`

function rangeText(r: WindowRange, unit: string): string {
  if (r.min !== undefined && r.max !== undefined) return `${num(r.min)}–${num(r.max)} ${unit}`
  return r.min !== undefined ? `at least ${num(r.min)} ${unit}` : `at most ${num(r.max!)} ${unit}`
}

/** "peak force 3.42–4.61 N within 3–5 N" for every quantity the window bounds. */
function bandSentence(window: ForceWindow, band: MetricBand): string[] {
  const parts: string[] = []
  for (const q of quantitiesOf(window.kind)) {
    const range = (window as unknown as Record<string, WindowRange | undefined>)[q.key]
    if (!range) continue
    const b = band[q.metric]
    if (!b) { parts.push(`${q.label.toLowerCase()} ${q.nullMeans === 'unbounded' ? 'unbounded (the face locks)' : 'missing'}`); continue }
    const [lo, hi] = q.sign === 1 ? b : [-b[1], -b[0]]
    parts.push(`${q.label.toLowerCase()} ${num(lo)}–${num(hi)} ${q.unit} within ${rangeText(range, q.unit)}`)
  }
  return parts
}

export function describeResult(
  rank: number,
  window: ForceWindow,
  band: MetricBand,
  score: CandidateScore,
  envelope: { x: number; y: number; z: number },
  material: SearchMaterial,
  confirmed: Confirmation | null,
): string {
  const judged = judge(window, band, { envelope })
  const numeric = judged.constraints.filter((c) => c.margin !== null && c.id !== 'bistable')
  const binding = numeric.reduce<typeof numeric[number] | null>((w, c) => (w === null || (c.margin as number) < (w.margin as number) ? c : w), null)
  const parts = bandSentence(window, band)
  let text = `#${rank} in ${material.name}: `
  text += parts.length ? `over the whole tolerance band ${parts.join(', ')}` : 'meets the window over the whole tolerance band'
  if (binding && score.windowMargin < 1000) text += `; the closest edge is "${binding.label.toLowerCase()}" (${pct(score.windowMargin)} of the window away)`
  text += '.'
  const sf = score.strainMargin === null ? null : score.strainMargin + 1
  if (sf !== null) text += ` Strain safety ${num(sf)} at the worst corner;`
  text += ` footprint ${num(envelope.x)} × ${num(envelope.y)} mm, envelope ${num((envelope.x * envelope.y * envelope.z) / 1000)} cm³.`
  if (confirmed) {
    if (confirmed.metrics === null) text += ` The exact method (${confirmed.method}) could not confirm it: ${confirmed.error}.`
    else {
      const worst = Math.max(0, ...Object.values(confirmed.agreement).map(Math.abs))
      text += ` The exact method (${confirmed.method}) agrees within ${worst < 0.001 ? '0.1' : Number((worst * 100).toPrecision(2))} %`
      if (confirmed.withinTolerance === true) text += ', inside the fast table\u2019s measured error'
      if (confirmed.withinTolerance === false) text += ', beyond the fast table\u2019s measured error: go by the exact figures'
      text += `${confirmed.verdict === 'outside' ? ' but puts the nominal part outside the window' : ''}.`
    }
  }
  return text
}

