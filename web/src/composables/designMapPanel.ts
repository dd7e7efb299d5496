/** Choices on the design-map panel: which parameters can be swept, and the defaults. */
import type { Family, Material, ParamRanges } from '@/api/types'
import { narrowRange } from './paramForm'
import { keyMetricSpec } from './metrics'
import { snapToStep, type DesignMapRequest } from './designMap'

export interface SweepOption {
  key: string
  label: string
  unit: string
  min: number
  max: number
  step: number
}

/** Parameters the entry lets vary (an allowed range wider than a point), whole-number ones left out. */
export function sweepOptions(family: Family, ranges: ParamRanges): SweepOption[] {
  return family.params
    .filter((p) => !p.integer)
    .map((p) => ({ key: p.key, label: p.label, unit: p.unit, step: p.step, ...narrowRange(p, ranges[p.key]) }))
    .filter((o) => o.max > o.min)
}

/**
 * The pair engineers look at first: the family's own choice (its folder's designMap.sweep) where
 * the entry lets both vary; otherwise a swept parameter across and the wall thickness up.
 */
export function defaultSweep(options: SweepOption[], family: Family): [string, string] | null {
  if (options.length < 2) return null
  const sweepable = (key: string) => options.some((o) => o.key === key)
  const wall = family.params.find((p) => p.role === 'wall' && sweepable(p.key))?.key
  const [preferredX, preferredY] = family.designMap?.sweep ?? []
  const x = preferredX !== undefined && sweepable(preferredX) ? preferredX : options.find((o) => o.key !== wall)!.key
  const y = preferredY !== undefined && sweepable(preferredY) && preferredY !== x ? preferredY : wall && wall !== x ? wall : options.find((o) => o.key !== x)!.key
  return [x, y]
}

export function metricOptions(family: Family): Array<{ key: string; label: string; unit: string }> {
  return family.metrics.filter((m) => m.unit !== 'boolean' && m.key !== 'strainLimit').map((m) => ({ key: m.key, label: m.label, unit: m.unit }))
}

export function defaultMetric(family: Family): string | null {
  return keyMetricSpec(family)?.key ?? metricOptions(family)[0]?.key ?? null
}

/** The worker's request, or null while something it needs is missing. */
export function mapRequest(family: Family, params: Record<string, number | string>, materials: readonly Material[], x: SweepOption | undefined, y: SweepOption | undefined, window: unknown | null): DesignMapRequest | null {
  if (!x || !y || x.key === y.key) return null
  const material = materials.find((m) => m.id === params.material) ?? materials[0]
  if (!material) return null
  const numbers: Record<string, number> = {}
  for (const p of family.params) numbers[p.key] = typeof params[p.key] === 'number' ? (params[p.key] as number) : p.default
  return {
    familyId: family.id,
    params: numbers,
    modulus: material.modulus,
    strainLimit: material.strainLimit,
    bending: { poissonRatio: material.poissonRatio, wideBeam: params.wideBeam === 'off' ? 'off' : 'auto' },
    x: { key: x.key, min: x.min, max: x.max },
    y: { key: y.key, min: y.min, max: y.max },
    window,
  }
}

/** The configuration a clicked cell stands for, on the parameters' own steps. */
export function adoptedParams(params: Record<string, number | string>, x: SweepOption, y: SweepOption, xValue: number, yValue: number): Record<string, number | string> {
  return { ...params, [x.key]: snapToStep(xValue, x.step, x.min, x.max), [y.key]: snapToStep(yValue, y.step, y.min, y.max) }
}
