/**
 * Side-by-side differences between two snapshots of an entry (two revisions, or a proposal
 * against the current revision): parameters, allowed ranges and metrics, each row marked
 * when it changed, and the words and numbers the tables show.
 */
import type { Family, MetricValue, ParamRanges } from '@/api/types'
import type { DiffRow, MetricDiffRow } from '@/api/curation'
import type { FeatureDifference } from '@catalog/calibration'
import { formatMetric, formatNumber } from './metrics'

export interface Snapshot {
  params: Record<string, number | string>
  ranges: ParamRanges
  metrics: Record<string, MetricValue>
}

export interface SnapshotDiff {
  params: Array<DiffRow<number | string>>
  ranges: Array<DiffRow<[number, number]>>
  metrics: MetricDiffRow[]
}

/** Same value for a table: numbers equal to 12 significant figures (a stored JSON round trip), else strict equality. */
export function sameValue(a: unknown, b: unknown): boolean {
  if (typeof a === 'number' && typeof b === 'number') return a === b || Math.abs(a - b) <= 1e-12 * Math.max(Math.abs(a), Math.abs(b))
  if (Array.isArray(a) && Array.isArray(b)) return a.length === b.length && a.every((v, i) => sameValue(v, b[i]))
  return (a ?? null) === (b ?? null)
}

/** Keys in the family's order first, then any the snapshots carry that the family does not (e.g. `material`). */
function orderedKeys(known: readonly string[], ...objects: Array<Record<string, unknown>>): string[] {
  const keys = [...known]
  for (const o of objects) for (const k of Object.keys(o)) if (!keys.includes(k)) keys.push(k)
  return keys.filter((k) => objects.some((o) => k in o))
}

/**
 * The rows of a diff of `a` (left, the older or current revision) and `b` (right). A range a
 * side does not narrow is the family's own, so both sides show a number.
 */
export function diffSnapshots(family: Pick<Family, 'params' | 'metrics'> | undefined, a: Snapshot, b: Snapshot): SnapshotDiff {
  const paramSpec = (key: string) => family?.params.find((p) => p.key === key)
  const paramKeys = family?.params.map((p) => p.key) ?? []
  const params = orderedKeys([...paramKeys, 'material'], a.params, b.params).map((key) => ({
    key,
    label: key === 'material' ? 'Material' : paramSpec(key)?.label ?? key,
    unit: paramSpec(key)?.unit ?? '',
    a: a.params[key] ?? null,
    b: b.params[key] ?? null,
    changed: !sameValue(a.params[key], b.params[key]),
  }))
  const familyRange = (key: string): [number, number] | null => {
    const spec = paramSpec(key)
    return spec ? [spec.min, spec.max] : null
  }
  // every parameter has a range: one a side does not narrow is the family's own
  const ranges = [...paramKeys, ...orderedKeys([], a.ranges, b.ranges).filter((k) => !paramKeys.includes(k))].map((key) => {
    const ra = a.ranges[key] ?? familyRange(key)
    const rb = b.ranges[key] ?? familyRange(key)
    return { key, label: paramSpec(key)?.label ?? key, unit: paramSpec(key)?.unit ?? '', a: ra, b: rb, changed: !sameValue(ra, rb) }
  })
  const metricKeys = orderedKeys(family?.metrics.map((m) => m.key) ?? [], a.metrics, b.metrics)
  const metrics = metricKeys.map((key) => {
    const spec = family?.metrics.find((m) => m.key === key)
    const va = a.metrics[key] ?? null
    const vb = b.metrics[key] ?? null
    return {
      key, label: spec?.label ?? key, unit: spec?.unit ?? '', a: va, b: vb,
      difference: typeof va === 'number' && typeof vb === 'number' ? vb - va : null,
      changed: !sameValue(va, vb),
    }
  })
  return { params, ranges, metrics }
}

/** The two sides of the server's diff rows as snapshots (a side without a value leaves the key out). */
export function snapshotsFromRows(diff: Pick<SnapshotDiff, 'params' | 'ranges' | 'metrics'>): { a: Snapshot; b: Snapshot } {
  const side = (which: 'a' | 'b'): Snapshot => {
    const pick = <T>(rows: Array<{ key: string; a: T | null; b: T | null }>) => {
      const out: Record<string, T> = {}
      for (const r of rows) if (r[which] !== null && r[which] !== undefined) out[r.key] = r[which] as T
      return out
    }
    return { params: pick(diff.params), ranges: pick(diff.ranges), metrics: pick(diff.metrics) }
  }
  return { a: side('a'), b: side('b') }
}

/** How many rows changed, for a one-line summary above the tables. */
export function changeCount(diff: Partial<SnapshotDiff>): number {
  return [...(diff.params ?? []), ...(diff.ranges ?? []), ...(diff.metrics ?? [])].filter((r) => r.changed).length
}

export function formatParamValue(value: number | string | null, unit: string, materialName?: (id: string) => string): string {
  if (value === null || value === undefined) return '—'
  if (typeof value === 'string') return materialName ? materialName(value) : value
  return unit ? `${formatNumber(value, 4)} ${unit}` : formatNumber(value, 4)
}

export function formatRange(range: [number, number] | null, unit: string): string {
  if (!range) return '—'
  const text = `${formatNumber(range[0], 4)}–${formatNumber(range[1], 4)}`
  return unit ? `${text} ${unit}` : text
}

/** A signed change with a true minus: "+0.42 N", "−12 %"; '' when there is none. */
export function formatSigned(value: number | null, unit = '', digits = 3): string {
  if (value === null || !Number.isFinite(value)) return ''
  const body = formatNumber(Math.abs(value), digits)
  const sign = value > 0 ? '+' : value < 0 ? '−' : '±'
  if (unit === '%') return `${sign}${body} %`
  return unit ? `${sign}${body} ${unit}` : `${sign}${body}`
}

export function formatMetricDifference(row: Pick<MetricDiffRow, 'a' | 'difference' | 'unit'>): string {
  if (row.difference === null || row.difference === 0) return ''
  const relative = typeof row.a === 'number' && row.a !== 0 ? ` (${formatSigned((row.difference / Math.abs(row.a)) * 100, '%', 2)})` : ''
  return `${formatSigned(row.difference, row.unit === 'boolean' ? '' : row.unit)}${relative}`
}

export function formatMetricCell(value: MetricValue | null, unit: string): string {
  return formatMetric(value ?? null, { unit })
}

/** A measured-against-predicted figure: "3.61 N vs 4.02 N, −10 %". */
export function formatFeatureDifference(d: FeatureDifference | null, unit: string): string {
  if (!d) return '—'
  const rel = d.relative === null ? formatSigned(d.difference, unit) : formatSigned(d.relative * 100, '%', 2)
  return `${formatNumber(d.measured)} ${unit} vs ${formatNumber(d.predicted)} ${unit}, ${rel}`
}

/** Text of an entry field for the fields diff (tags and materials as lists). */
export function formatFieldValue(value: unknown, materialName?: (id: string) => string): string {
  if (Array.isArray(value)) {
    if (!value.length) return '—'
    return value.map((v) => (materialName && typeof v === 'string' ? materialName(v) : String(v))).join(', ')
  }
  if (value === null || value === undefined || value === '') return '—'
  return String(value)
}
