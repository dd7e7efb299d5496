/**
 * Plain words for the verdict of a configuration against the force window (the judge lives in
 * catalog/window/judge.ts; these helpers only phrase what it found).
 */
import type { ConstraintCheck, Judgement, StrainCheck, Verdict } from '@catalog/window/judge'
import { formatNumber } from './metrics'

export const verdictLabels: Record<Verdict, string> = {
  inside: 'Inside the window',
  edge: 'At the edge',
  outside: 'Outside',
}

/** "+32 %" / "−4 %": a relative margin as a signed percentage of the bound's scale. */
export function formatMargin(margin: number | null): string {
  if (margin === null || !Number.isFinite(margin)) return '—'
  if (Math.abs(margin) >= 10) return margin > 0 ? 'far inside' : 'far outside'
  const pct = margin * 100
  const text = formatNumber(Math.abs(pct), 2)
  if (text === '0') return '0 %'
  return `${pct > 0 ? '+' : '−'}${text} %`
}

/** One constraint as a line: what was asked, what the part gives, how far from the bound. */
export function describeConstraint(c: ConstraintCheck): { asked: string; found: string; margin: string } {
  const unit = c.unit ? ` ${c.unit}` : ''
  if (c.id === 'bistable') {
    return { asked: c.label, found: c.verdict === 'outside' ? 'No: it springs back' : 'Yes', margin: '' }
  }
  const asked = c.bound === null ? c.label : `${c.label} ${formatNumber(c.bound)}${unit}`
  let found: string
  if (c.value !== null) found = `${formatNumber(c.value)}${unit}`
  else if (c.margin !== null) found = 'no finite value (locks)'
  else found = 'not reached'
  return { asked, found, margin: formatMargin(c.margin) }
}

/** "Peak force at most 5 N" → "peak force at most 5 N": only the first letter, units keep their case. */
const lowerFirst = (text: string) => text.charAt(0).toLowerCase() + text.slice(1)

/** A sentence under the verdict, naming the binding constraint when there is one. */
export function verdictSentence(j: Judgement, scope: 'nominal' | 'band'): string {
  const who = scope === 'nominal' ? 'The nominal part' : 'Every tolerance corner'
  const same = j.constraints.filter((c) => c.verdict === j.verdict)
  // inside or at the edge, the closest bound is a numeric one (a second stable position has no margin)
  const candidates = j.verdict === 'outside' ? same : same.filter((c) => c.margin !== null)
  const worst = [...candidates].sort((a, b) => (a.margin ?? -Infinity) - (b.margin ?? -Infinity))[0]
  if (!worst) return `${who} meets every bound of the window.`
  const { asked, found } = describeConstraint(worst)
  switch (j.verdict) {
    case 'inside': return `${who} is inside every bound; the closest is ${lowerFirst(asked)} (${found}).`
    case 'edge': return `${scope === 'nominal' ? 'The nominal part' : 'Part of the band'} is within 5 % of a bound: ${lowerFirst(asked)} (${found}).`
    case 'outside': return scope === 'nominal'
      ? `The nominal part misses ${lowerFirst(asked)} (${found}).`
      : `Some tolerance corner misses ${lowerFirst(asked)} (${found}).`
  }
}

/** The strain line: safety factor against the material's limit and its verdict in words. */
export function describeStrain(s: StrainCheck | null): { factor: string; words: string; verdict: Verdict | null } {
  if (!s) return { factor: '—', words: 'The method does not report the strain.', verdict: null }
  const factor = `${formatNumber(s.safetyFactor, 3)} ×`
  if (s.basis === 'working-range') {
    return s.verdict === 'outside'
      ? { factor, words: 'Strain above the material limit inside the working range: the part may crack or yield.', verdict: s.verdict }
      : { factor, words: 'The strain limit sets the working range: the largest travel or rotation shown is where the strain reaches it.', verdict: s.verdict }
  }
  if (s.verdict === 'outside') return { factor, words: 'Strain above the material limit: the part may crack or yield.', verdict: s.verdict }
  if (s.verdict === 'edge') return { factor, words: 'Strain close to the material limit: little reserve for fatigue.', verdict: s.verdict }
  return { factor, words: 'Strain below the material limit.', verdict: s.verdict }
}
