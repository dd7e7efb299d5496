/** Showing metrics: which one is an entry's key figure, and how numbers are written. */
import type { Family, MetricSpec, MetricValue, ModuleKind } from '@/api/types'

// the figure engineers compare first, by kind of module (common practice in specifying
// actuation feel: snap force for switches, stiffness for springs and guides, etc.)
const keyMetricPreference: Record<ModuleKind, string[]> = {
  bistable: ['peakForce'],
  spring: ['stiffness', 'springRate'],
  guide: ['stiffness', 'axialStiffness'],
  hinge: ['rotationalStiffness', 'stiffness'],
  latch: ['matingForce', 'insertionForce', 'peakForce'],
}

/** The key metric of a family: the preferred one for its kind, else its first dimensioned number. */
export function keyMetricSpec(family: Pick<Family, 'kind' | 'metrics'> | undefined): MetricSpec | null {
  if (!family) return null
  for (const key of keyMetricPreference[family.kind] ?? []) {
    const spec = family.metrics.find((m) => m.key === key)
    if (spec) return spec
  }
  return family.metrics.find((m) => m.unit !== '' && m.unit !== 'boolean') ?? null
}

/** A number with about three significant figures, a true minus sign and no exponent. */
export function formatNumber(value: number, digits = 3): string {
  if (!Number.isFinite(value)) return '—'
  if (value === 0) return '0'
  const abs = Math.abs(value)
  let text: string
  if (abs >= 10 ** digits) text = Math.round(abs).toLocaleString('en-US')
  else {
    const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(abs)))
    text = Number(abs.toFixed(Math.min(decimals, 8))).toString()
  }
  return (value < 0 ? '−' : '') + text
}

export function formatMetric(value: MetricValue | undefined, spec?: Pick<MetricSpec, 'unit'>): string {
  if (value === null || value === undefined) return '—'
  if (typeof value === 'boolean') return value ? 'Yes' : 'No'
  const unit = spec?.unit && spec.unit !== 'boolean' ? spec.unit : ''
  if (unit === '%') return `${formatNumber(value)} %`
  return unit ? `${formatNumber(value)} ${unit}` : formatNumber(value)
}

export interface ForceWindow {
  min: number | null
  max: number | null
}

/** True when a value lies inside the window (open ends allowed); false without any bound. */
export function insideWindow(value: MetricValue | undefined, window: ForceWindow | null): boolean {
  if (typeof value !== 'number' || !window) return false
  if (window.min === null && window.max === null) return false
  return (window.min === null || value >= window.min) && (window.max === null || value <= window.max)
}
