/**
 * What the search screen shows of an answer: progress as a fraction and a sentence, and per
 * result the figures the table lists. Pure, so it is tested without Vue.
 */
import type { SearchProgress, SearchResult } from '@/api'
import type { Family } from '@/api/types'
import { windowQuantities, type WindowKind } from '@catalog/window/quantities'
import { formatNumber } from './metrics'

/** Sampling and refinement take most of the time; confirmation with the exact solver the rest. */
export function progressFraction(p: SearchProgress | null): number {
  if (!p) return 0
  if (p.phase === 'done') return 1
  if (p.phase === 'confirming') return 0.95
  return p.total > 0 ? Math.min(0.9, (0.9 * p.done) / p.total) : 0
}

export function progressText(p: SearchProgress | null): string {
  if (!p) return 'Starting the search…'
  const count = `${p.considered.toLocaleString('en-US')} candidates estimated`
  switch (p.phase) {
    case 'confirming': return `Checking the best with the exact solver · ${count}`
    case 'done': return `Finished · ${count}`
    default: return `Entry and material ${Math.min(p.total, Math.ceil(p.done))} of ${p.total} · ${count}`
  }
}

export interface ResultFigure {
  key: string
  label: string
  unit: string
  /** Nominal value in the window's sign (holding force positive). */
  value: number | null
  /** The tolerance band in the window's sign, low to high. */
  band: [number, number] | null
}

/** The window's quantities for one result, in the window's own sign and units. */
export function resultFigures(kind: WindowKind, result: SearchResult): ResultFigure[] {
  return windowQuantities[kind].map((q) => {
    const raw = result.metrics[q.metric]
    const band = result.band[q.metric] ?? null
    const value = typeof raw === 'number' ? q.sign * raw : null
    const signed: [number, number] | null = band ? (q.sign === 1 ? [band[0], band[1]] : [-band[1], -band[0]]) : null
    return { key: q.key, label: q.label, unit: q.unit, value, band: signed }
  })
}

export function figureText(f: ResultFigure): string {
  if (f.value === null) return '—'
  return `${formatNumber(f.value)} ${f.unit}`
}

export function bandText(f: ResultFigure): string {
  return f.band ? `${formatNumber(f.band[0])}–${formatNumber(f.band[1])}` : ''
}

/** "Span 69.5 mm · Apex height 2.2 mm · …": the configuration in the family's own words. */
export function paramSummary(family: Family | undefined, params: SearchResult['params']): Array<{ key: string; label: string; text: string }> {
  if (!family) return Object.entries(params).filter(([k]) => k !== 'material').map(([k, v]) => ({ key: k, label: k, text: String(v) }))
  return family.params.map((spec) => {
    const v = params[spec.key]
    return { key: spec.key, label: spec.label, text: typeof v === 'number' ? `${formatNumber(v, 4)}${spec.unit ? ` ${spec.unit}` : ''}` : '—' }
  })
}

/** The exact solver's word on a result: agreement as the largest relative difference. */
export function confirmationText(result: SearchResult): { text: string; tone: 'inside' | 'edge' | 'outside' | 'none' } {
  const c = result.confirmed
  if (!c) return { text: 'Not checked', tone: 'none' }
  if (!c.metrics) return { text: `Exact solver failed: ${c.error ?? 'no answer'}`, tone: 'outside' }
  const worst = Math.max(0, ...Object.values(c.agreement).map((a) => Math.abs(a)))
  const verdict = c.verdict === 'inside' ? 'inside' : c.verdict === 'edge' ? 'at the edge' : 'outside'
  return { text: `${verdict}, within ${formatNumber(worst * 100, 2)} %`, tone: c.verdict ?? 'none' }
}

/** The entry screen's address with a result's configuration filled in. */
export function configureLocation(result: Pick<SearchResult, 'entryId' | 'params'>): { path: string; query: { params: string } } {
  return { path: `/entries/${result.entryId}`, query: { params: JSON.stringify(result.params) } }
}
