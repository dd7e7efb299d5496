/** The explanation of an empty answer: which constraint ruled candidates out, and how far the nearest was. */
import type { PrinterRules } from '../printability'
import { judge, quantitiesOf, type CompiledWindow, type ForceWindow } from '../window'
import type { FamilyDefinition } from '../schema/types'
import type { CandidateScore } from './candidate'
import type { SearchMaterial, ShelfEntry } from './types'
import { num, pct } from './why'

/** The candidate that came nearest (the engine's scored candidate, as the explanation reads it). */
interface NearestCandidate {
  unit: { entry: ShelfEntry; family: FamilyDefinition; material: SearchMaterial }
  params: Record<string, number>
  score: CandidateScore
  area: number
  volume: number
}

export interface Tally {
  entries: { released: number; ofKind: number; matchingText: number | null; withMaterial: number }
  /** Rejections per reason (a bound id, 'bistable', 'strain', 'footprint.length', 'rules', 'model'). */
  reasons: Record<string, number>
  unprintable: string[]
  notes: string[]
  nearest: NearestCandidate | null
  considered: number
}

function reasonLabel(window: ForceWindow, reason: string): string {
  const [key, side] = reason.split('.')
  const q = quantitiesOf(window.kind).find((x) => x.key === key)
  if (q) return `${q.label.toLowerCase()} ${side === 'min' ? 'below' : 'above'} the window`
  switch (reason) {
    case 'bistable': return 'no second stable position (springs back)'
    case 'strain': return 'strain over the material\u2019s limit'
    case 'footprint.length': return 'longer than the footprint'
    case 'footprint.width': return 'wider than the footprint'
    case 'rules': return 'outside the family\u2019s geometry rules'
    default: return 'outside what the fast estimate covers'
  }
}

export function explainEmpty(window: ForceWindow, _compiled: CompiledWindow, tally: Tally, rules: PrinterRules): string {
  const e = tally.entries
  const kind = `${window.kind} module`
  if (e.released === 0) return 'No configuration found: the shelf has no released entries.'
  if (e.ofKind === 0) return `No configuration found: no released entry is a ${kind}.`
  if (e.matchingText === 0) return `No configuration found: no released ${kind} matches the text "${window.text}".`
  if (e.withMaterial === 0) return `No configuration found: no released ${kind} is offered in ${window.materials!.join(', ')}.`
  if (tally.considered === 0) return `No configuration found: nothing is printable on a ${rules.nozzle} mm nozzle — ${tally.unprintable.join('; ')}.`
  const ranked = Object.entries(tally.reasons).sort((a, b) => b[1] - a[1])
  const share = ranked.map(([r, n]) => `${reasonLabel(window, r)}: ${n} (${pct(n / tally.considered)})`).join('; ')
  let text = `No configuration found among ${tally.considered} candidates from ${e.withMaterial} entr${e.withMaterial === 1 ? 'y' : 'ies'}. Ruled out by ${share}.`
  const near = tally.nearest
  if (near && near.score.low && near.score.high) {
    const env = near.unit.family.envelope(near.params)
    const band: Record<string, [number, number] | null> = {}
    for (const [k, lo] of Object.entries(near.score.low)) {
      const hi = near.score.high[k]
      if (typeof lo === 'number' && typeof hi === 'number') band[k] = [lo, hi]
      else if (lo === null) band[k] = null
    }
    const judged = judge(window, band, { envelope: env })
    const worst = judged.constraints.filter((c) => c.margin !== null).sort((a, b) => (a.margin as number) - (b.margin as number))[0]
    const where = near.score.banded ? 'at its worst tolerance corner' : 'at its nominal size'
    const params = Object.entries(near.params).map(([k, v]) => `${k} ${num(v)}`).join(', ')
    if (worst && (worst.margin as number) < 0) {
      text += ` The nearest was "${near.unit.entry.name}" in ${near.unit.material.name} (${params}): ${worst.label.toLowerCase()} ${num(worst.bound as number)} ${worst.unit} but ${where} it gives ${num(worst.value as number)} ${worst.unit}, short by ${pct(-(worst.margin as number))} of the window.`
    } else if (near.score.reason === 'strain' && near.score.strainMargin !== null) {
      text += ` The nearest was "${near.unit.entry.name}" in ${near.unit.material.name} (${params}): strain safety ${num(near.score.strainMargin + 1)} ${where}, below 1.`
    } else {
      text += ` The nearest was "${near.unit.entry.name}" in ${near.unit.material.name} (${params}): ${reasonLabel(window, near.score.reason ?? 'model')}.`
    }
  }
  else if (near && near.score.reason?.startsWith('footprint') && near.score.footprintMargin !== null && window.footprint) {
    const env = near.unit.family.envelope(near.params)
    const fp = window.footprint
    const box = [fp.length, fp.width].map((v) => (v === undefined ? 'any' : num(v))).join(' × ')
    text += ` The nearest was "${near.unit.entry.name}" at ${num(env.x)} × ${num(env.y)} mm against a footprint of ${box} mm (over by ${pct(-near.score.footprintMargin)}).`
  } else if (near) {
    text += ` The nearest was "${near.unit.entry.name}": ${reasonLabel(window, near.score.reason ?? 'model')}.`
  }
  if (tally.unprintable.length) text += ` Not printable on this printer: ${tally.unprintable.join('; ')}.`
  return text
}
