/**
 * Comparing up to four candidates side by side: search results (an entry and its parameters)
 * or the viewer's saved configurations. Each is checked exactly as the configure screen
 * checks it (checkTarget: nominal curve, tolerance band, printability); the metrics are laid
 * out row by row with the best of each row marked where "best" has a direction.
 */
import { z } from 'zod'
import type * as contract from '../../contract/api'
import Papa from 'papaparse'
import type { AppContext } from '../context'
import type { User } from '../db'
import { validationFailed } from '../errors'
import { zodIssues } from '../validation'
import { getFamily } from '../../catalog'
import { checkTarget, configureTarget, loadEntry, resolveFor, type CheckResult } from './configure'
import { openOwn, resolveSaved } from './configurations'
import { neutraliseCsvFormulae } from './csv-safety'

const MAX_COMPARED = 4

const paramValue = z.union([z.number(), z.string().max(64)])
const itemSchema = z.union([
  z.strictObject({ entryId: z.number().int().positive(), params: z.record(z.string().max(64), paramValue).optional() }),
  z.strictObject({ configurationId: z.number().int().positive() }),
])
const itemsSchema = z.array(itemSchema, { error: 'items must be a list' }).min(1, 'items must name at least one candidate').max(MAX_COMPARED, `items may name at most ${MAX_COMPARED} candidates`)

export type CompareItem = z.infer<typeof itemSchema>

/** `?items=[…]` as JSON; 400 naming the field when it is not a list of 1–4 candidates. */
export function parseCompareQuery(query: Record<string, unknown>): CompareItem[] {
  const raw = query.items
  if (typeof raw !== 'string') throw validationFailed([{ field: 'items', message: 'items is required: a JSON list of { entryId, params } or { configurationId }' }])
  let parsed: unknown
  try {
    parsed = JSON.parse(raw)
  } catch {
    throw validationFailed([{ field: 'items', message: 'items must be JSON' }])
  }
  const result = itemsSchema.safeParse(parsed)
  if (!result.success) throw validationFailed(zodIssues(result.error).map((i) => ({ ...i, field: i.field ? `items.${i.field}` : 'items' })))
  return result.data
}

/** Which way is better for a metric, where the trade says so; null when it depends on the design. */
function betterDirection(key: string): 'higher' | 'lower' | null {
  if (/safety/i.test(key) || key === 'holdingForce' || key === 'energyBarrier' || key === 'retentionForce' || key === 'rotation' || key === 'travel') return 'higher'
  if (/strain/i.test(key) || /stress/i.test(key) || key === 'parasitic' || key === 'parasiticMotion') return 'lower'
  return null
}

// The answer's shape is the wire contract's (contract/api.ts).
type ComparedCandidate = z.infer<typeof contract.ComparedCandidate>
type MetricRow = Comparison['metrics'][number]
export type Comparison = z.infer<typeof contract.Comparison>

const COMPARISON_CAUTIONS = [
  'Every figure is an estimate from a published model and nominal material data: confirm it on printed parts.',
  'Polymers creep under sustained load and fatigue under repeated cycling.',
  'Parts whose failure could hurt someone must follow the applicable codes and pass qualified engineering review.',
]

export async function buildComparison(context: AppContext, viewer: User, items: CompareItem[]): Promise<Comparison> {
  const candidates: ComparedCandidate[] = []
  for (const item of items) {
    if ('configurationId' in item) {
      const opened = await openOwn(context, viewer, item.configurationId)
      const check = await checkTarget(opened.target, resolveSaved(opened))
      candidates.push({ label: `${opened.view.name} (saved)`, source: { kind: 'saved', configurationId: item.configurationId, name: opened.view.name }, check })
    } else {
      const entry = await loadEntry(context, viewer, item.entryId)
      const target = await configureTarget(context, entry)
      const input = resolveFor(target, { params: item.params ?? {} })
      const check = await checkTarget(target, input)
      candidates.push({ label: entry.name, source: { kind: 'result', entryId: item.entryId, params: input.params }, check })
    }
  }
  // the same entry twice gets its place in the list, so rows and curves can tell them apart
  const names = candidates.map((c) => c.label)
  candidates.forEach((c, i) => {
    if (names.filter((n) => n === c.label).length > 1) c.label = `${c.label} #${i + 1}`
  })
  const specs = new Map<string, { label: string; unit: string }>()
  for (const c of candidates) {
    for (const m of c.check.evaluation.metrics ? Object.keys(c.check.evaluation.metrics) : []) {
      if (specs.has(m)) continue
      const spec = metricSpecOf(c.check, m)
      specs.set(m, spec)
    }
  }
  const metrics: MetricRow[] = [...specs].map(([key, spec]) => {
    const values = candidates.map((c) => c.check.evaluation.metrics[key] ?? null)
    const bands = candidates.map((c) => c.check.band.metrics[key] ?? null)
    const better = spec.unit === 'boolean' ? null : betterDirection(key)
    const numeric = values.map((v, i) => [v, i] as const).filter((p): p is readonly [number, number] => typeof p[0] === 'number')
    let best: number | null = null
    if (better && numeric.length >= 2) {
      const pick = numeric.reduce((a, b) => ((better === 'higher' ? b[0] > a[0] : b[0] < a[0]) ? b : a))
      best = numeric.every((p) => p[0] === pick[0]) ? null : pick[1]
    }
    return { key, label: spec.label, unit: spec.unit, values, bands, better, best }
  })
  const checkIds = new Set<string>()
  for (const c of candidates) for (const k of c.check.printability.checks) checkIds.add(k.id)
  const printability = [...checkIds].map((id) => ({
    id,
    label: printCheckLabel(id),
    statuses: candidates.map((c) => {
      const k = c.check.printability.checks.find((x) => x.id === id)
      return k ? `${k.level}: ${k.message}` : null
    }),
    levels: candidates.map((c) => c.check.printability.checks.find((x) => x.id === id)?.level ?? null),
  }))
  return { candidates, metrics, printability, cautions: COMPARISON_CAUTIONS }
}

function metricSpecOf(check: CheckResult, key: string): { label: string; unit: string } {
  const spec = getFamily(check.entry.familyId).metrics.find((m) => m.key === key)
  return spec ? { label: spec.label, unit: spec.unit } : { label: key, unit: '' }
}

/** `wall.thickness` → "Wall: thickness"; `layer` → "Layer". */
function printCheckLabel(id: string): string {
  const [what, key] = id.split('.')
  const head = what.charAt(0).toUpperCase() + what.slice(1)
  return key ? `${head}: ${key.replace(/([A-Z])/g, ' $1').toLowerCase()}` : head
}

const cell = (v: number | boolean | null) => (v === null ? '' : typeof v === 'boolean' ? (v ? 'yes' : 'no') : String(Number(v.toPrecision(6))))

/** One column per candidate; metric rows (nominal, then the band), then printability. Formula cells neutralised. */
export function comparisonCsv(comparison: Comparison): string {
  const header = ['Quantity', 'Unit', ...comparison.candidates.map((c) => c.label)]
  const rows: string[][] = []
  rows.push(['Entry', '', ...comparison.candidates.map((c) => c.check.entry.name)])
  rows.push(['Family', '', ...comparison.candidates.map((c) => c.check.entry.familyName)])
  rows.push(['Parameters', '', ...comparison.candidates.map((c) => Object.entries(c.check.evaluation.params).map(([k, v]) => `${k}=${v}`).join('; '))])
  for (const m of comparison.metrics) {
    rows.push([`${m.label}${m.best !== null ? ` (best: ${comparison.candidates[m.best].label}, ${m.better} is better)` : ''}`, m.unit === 'boolean' ? '' : m.unit, ...m.values.map(cell)])
    if (m.bands.some((b) => b)) rows.push([`${m.label}, tolerance band`, m.unit === 'boolean' ? '' : m.unit, ...m.bands.map((b) => (b ? `${cell(b[0])} to ${cell(b[1])}` : ''))])
  }
  for (const p of comparison.printability) rows.push([`Printability: ${p.label}`, '', ...p.statuses.map((s) => s ?? 'not checked')])
  for (const c of comparison.cautions) rows.push([c, ''])
  return neutraliseCsvFormulae(Papa.unparse({ fields: header, data: rows }, { newline: '\r\n' })) + '\r\n'
}
