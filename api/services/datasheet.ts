/**
 * The data sheet of a configuration, as sections of plain data. The web app's printable page
 * and the PDF (datasheet-pdf.ts) are both drawn from this one builder, so they cannot disagree.
 */
import type { z } from 'zod'
import type * as contract from '../../contract/api'
import type { FamilyDefinition, MetricValue } from '../../catalog'
import { valuesAt } from '../../catalog/tolerance'
import type { ForceWindow } from '../../catalog/window'
import type { ConfigurationInput } from './configuration-input'
import { checkTarget, type ConfigureTarget } from './configure'
import { downloadFileName } from './file-names'
import { GENERAL_CAUTIONS, mergeCautions } from './cautions'
import { RAD_PER_DEG } from '../../catalog/units'

/** Said on every data sheet, whatever the family, unless the family's own cautions make the same point (cautions.ts). */
export const DATASHEET_CAUTIONS: readonly string[] = GENERAL_CAUTIONS

// The answers' shapes are the wire contract's (contract/api.ts).
export type WindowOverlay = z.infer<typeof contract.WindowOverlay>
type CurveMarker = z.infer<typeof contract.CurveMarker>
export type Datasheet = z.infer<typeof contract.Datasheet>


type Range = { min?: number; max?: number } | undefined

/** The window's bounds in the curve's units (only the quantities the curve can show). */
function windowOverlay(window: ForceWindow | null, family: FamilyDefinition): WindowOverlay[] {
  if (!window) return []
  const w = window as unknown as Record<string, Range>
  const out: WindowOverlay[] = []
  const range = (r: NonNullable<Range>) => ({ min: r.min ?? null, max: r.max ?? null })
  const side = (r: NonNullable<Range>, unit: string) =>
    [r.min !== undefined ? `at least ${r.min} ${unit}` : '', r.max !== undefined ? `at most ${r.max} ${unit}` : ''].filter(Boolean).join(', ')
  for (const key of ['peakForce', 'matingForce'] as const) {
    const r = w[key]
    if (r) out.push({ kind: 'force-range', id: key, label: `${key === 'peakForce' ? 'Peak force' : 'Mating force'} ${side(r, 'N')}`, ...range(r) })
  }
  const holding = w.holdingForce
  if (holding) {
    // a holding force h pulls back into the second position: the valley force lies at or below −h
    out.push({ kind: 'force-range', id: 'holdingForce', label: `Holding force ${side(holding, 'N')} (valley at or below its negative)`, min: holding.max !== undefined ? -holding.max : null, max: holding.min !== undefined ? -holding.min : null })
  }
  for (const key of ['travel', 'rotation'] as const) {
    const r = w[key]
    if (r) out.push({ kind: 'displacement-range', id: key, label: `${key === 'travel' ? 'Travel' : 'Rotation'} ${side(r, key === 'travel' ? 'mm' : 'deg')}`, ...range(r) })
  }
  const stiffness = w.stiffness
  if (stiffness) out.push({ kind: 'slope-range', id: 'stiffness', label: `Stiffness ${side(stiffness, 'N/mm')}`, ...range(stiffness) })
  const rotational = w.rotationalStiffness
  if (rotational && family.axes.displacement.unit === 'deg') {
    // N·mm/rad against a curve in degrees: the slope on the plot is k · π/180 per degree
    out.push({
      kind: 'slope-range', id: 'rotationalStiffness', label: `Rotational stiffness ${side(rotational, 'N·mm/rad')}`,
      min: rotational.min !== undefined ? rotational.min * RAD_PER_DEG : null, max: rotational.max !== undefined ? rotational.max * RAD_PER_DEG : null,
    })
  }
  return out
}

function forceAt(displacement: number[], force: number[], at: number): number {
  const values = valuesAt(displacement, force, at)
  // a stable or unstable position is a zero crossing: take the crossing nearest zero
  return values.length ? values.reduce((best, v) => (Math.abs(v) < Math.abs(best) ? v : best)) : 0
}

/** Stable and unstable positions a bistable module reports (its rest position at 0 included). */
function curveMarkers(metrics: Record<string, MetricValue>, curve: { displacement: number[]; force: number[] }): CurveMarker[] {
  const out: CurveMarker[] = []
  const unstable = metrics.unstablePosition
  const second = metrics.secondStablePosition
  if (typeof second !== 'number' && typeof unstable !== 'number') return out
  out.push({ kind: 'stable', label: 'As printed (stable)', displacement: 0, force: forceAt(curve.displacement, curve.force, 0) })
  if (typeof unstable === 'number') out.push({ kind: 'unstable', label: 'Unstable position', displacement: unstable, force: forceAt(curve.displacement, curve.force, unstable) })
  if (typeof second === 'number') out.push({ kind: 'stable', label: 'Second stable position', displacement: second, force: forceAt(curve.displacement, curve.force, second) })
  return out
}

export interface DatasheetOptions {
  configuration?: { id: number; name: string } | null
  now?: Date
}

export async function buildDatasheet(target: ConfigureTarget, input: ConfigurationInput, options: DatasheetOptions = {}): Promise<Datasheet> {
  const { entry, family } = target
  const check = await checkTarget(target, input, 'datasheet')
  const { evaluation, band } = check
  const now = options.now ?? new Date()
  const method = family.methods.find((m) => m.id === evaluation.method)!
  const curated = evaluation.material.id ? target.materials.find((m) => m.id === evaluation.material.id) : undefined
  const overridden = input.params.modulus !== undefined || input.params.strainLimit !== undefined || input.params.poissonRatio !== undefined
  const materialSource = overridden
    ? `given with the configuration${curated ? `, overriding the curated ${curated.name} (${curated.source})` : ''}`
    : curated ? `${curated.source} ${curated.poissonRatioSource}` : 'built-in value'

  const cautions = mergeCautions(DATASHEET_CAUTIONS, family.cautions)

  return {
    title: `Data sheet: ${entry.name}`,
    generatedAt: now.toISOString(),
    date: now.toISOString().slice(0, 10),
    fileName: downloadFileName(entry.name, family, evaluation.params, 'pdf', 'datasheet'),
    entry: { id: entry.id, name: entry.name, summary: entry.summary, status: entry.status, revision: check.entry.revision },
    family: { id: family.id, name: family.name, kind: family.kind },
    configuration: options.configuration ?? null,
    parameters: family.params.map((p) => ({ key: p.key, label: p.label, value: evaluation.params[p.key] as number, unit: p.unit })),
    material: { ...evaluation.material, source: materialSource },
    method: { id: method.id, label: method.label, source: method.source, bending: evaluation.bending?.statement ?? null },
    curve: {
      axes: evaluation.curve.axes,
      displacement: evaluation.curve.displacement,
      force: evaluation.curve.force,
      band,
      window: windowOverlay(input.window, family),
      markers: curveMarkers(evaluation.metrics, evaluation.curve),
    },
    metrics: family.metrics.map((m) => ({ key: m.key, label: m.label, unit: m.unit, value: evaluation.metrics[m.key] ?? null, band: band.metrics[m.key] ?? null })),
    verdict: check.verdict && input.window ? { window: input.window, ...check.verdict } : null,
    printability: check.printability,
    envelope: check.envelope,
    warnings: [...evaluation.warnings, ...band.warnings],
    cautions,
    notices: check.notices,
  }
}
