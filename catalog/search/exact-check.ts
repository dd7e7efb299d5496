/**
 * The exact check of a search result: the family's exact method at the nominal parameters and
 * at the tolerance corners, judged against the window with the same rule as every candidate
 * (scoreBand and the shared strain rule). A result the check contradicts — its bistable flag
 * flips, or a confirmed metric leaves the window over the band — is dropped by the engine and
 * named in the explanation. Where the fast estimate says of itself that it is uncertain (the
 * bistable table near its limits: families/bistable-beam/uncertainty.ts), search judges the
 * result this way whatever its rank.
 */
import { evaluateFamily } from '../evaluate'
import { DEFAULT_WIDE_BEAM, type WideBeamMode } from '../mechanics/wide-beam'
import type { FamilyDefinition, MetricValue } from '../schema/types'
import { MODULUS_RANGE } from '../tolerance/corners'
import { judge, scoreBand, strainHolds, type CompiledWindow, type ForceWindow } from '../window'
import type { ManufacturingTolerance } from '../window/schema'
import { tableUncertainty, uncertaintyText, type UncertaintyReason } from '../families/bistable-beam/uncertainty'
import { estimateAllowance } from './estimate-tolerance'
import { estimatorFor, exactMethodOf } from './estimators'
import type { Confirmation, SearchMaterial } from './types'

/**
 * Why the fast estimate at these parameters is uncertain (empty when it is not), and whether
 * that can change the verdict: a small energy barrier alone cannot (no window bounds the
 * barrier), the others can (the bistable flag, the holding force, the second position).
 */
export function uncertaintyOf(family: FamilyDefinition, params: Record<string, number>): { reasons: string[]; decisive: boolean } {
  if (family.id !== 'bistable-beam') return { reasons: [], decisive: false }
  const reasons: UncertaintyReason[] = tableUncertainty({ span: params.span, apexHeight: params.apexHeight, thickness: params.thickness, postLength: params.postLength }) ?? []
  return { reasons: reasons.map(uncertaintyText), decisive: reasons.some((r) => r !== 'small barrier') }
}

export interface ExactCheck {
  confirmation: Confirmation
  /** Why the exact method contradicts the result (null when it agrees or could not be run). */
  contradiction: string | null
}

type Band = { low: Record<string, MetricValue>; high: Record<string, MetricValue> }

function foldInto(band: Band | null, keys: readonly string[], m: Record<string, MetricValue>): Band {
  if (!band) return { low: { ...m }, high: { ...m } }
  for (const k of keys) {
    const v = m[k], lo = band.low[k], hi = band.high[k]
    if (typeof v === 'number' && typeof lo === 'number' && typeof hi === 'number') {
      band.low[k] = Math.min(lo, v)
      band.high[k] = Math.max(hi, v)
    } else if (typeof v === 'boolean' && typeof lo === 'boolean' && typeof hi === 'boolean') {
      band.low[k] = lo && v
      band.high[k] = hi || v
    } else if (v !== lo || v !== hi) {
      band.low[k] = null
      band.high[k] = null
    }
  }
  return band
}

const pct = (v: number) => `${Number((v * 100).toPrecision(2))} %`

/**
 * Runs the exact method over the tolerance band of one result. Modulus corners are taken from
 * the thickness corners by the estimator layout's modulus powers (every exact method here is
 * linear elastic: forces, stiffnesses and energies ∝ E, the rest independent of E; the layout
 * test holds the estimators to it and the exact methods share the property).
 */
export function exactCheck(
  window: ForceWindow, compiled: CompiledWindow, family: FamilyDefinition, material: SearchMaterial,
  params: Record<string, number>, nominal: Record<string, MetricValue>, tolerance: ManufacturingTolerance, materials: readonly SearchMaterial[],
  uncertain: string[],
  /**
   * The fast band (low/high records) when the estimate is certain: the exact band is then taken
   * as the fast band shifted by the exact method's difference at the nominal point (one exact
   * solve; a certain estimate is within the table's small measured error across its band).
   * Null: every tolerance corner is solved exactly.
   */
  fastBand: { low: Record<string, MetricValue>; high: Record<string, MetricValue> } | null = null,
  /** The entry's wide-beam rule (search estimated with the same). */
  wideBeam: WideBeamMode = DEFAULT_WIDE_BEAM,
): ExactCheck {
  const method = exactMethodOf(family)
  const keys = [...new Set([...compiled.metrics, 'bistable', 'safetyFactor'])]
  const layout = estimatorFor(family).layout
  const power = (k: string) => (layout ? layout.modulusPower[layout.keys.indexOf(k)] ?? 0 : 0)
  const walls = family.params.filter((p) => p.role === 'wall')
  const run = (p: Record<string, number>) => evaluateFamily(family, { ...p, material: material.id, ...(family.bendsBeams ? { wideBeam } : {}) }, { method, materials: [...materials] }).metrics
  let exact: Record<string, MetricValue>
  try {
    exact = run(params)
  } catch (e) {
    return { confirmation: { method, metrics: null, agreement: {}, error: (e as Error).message, ...(uncertain.length ? { uncertain } : {}) }, contradiction: null }
  }
  const metrics: Record<string, MetricValue> = {}
  const agreement: Record<string, number> = {}
  const allowance = estimateAllowance(family, exact, params)
  const stated: Record<string, number> = {}
  let withinTolerance: boolean | undefined
  for (const key of compiled.metrics) {
    const value = exact[key] ?? null
    metrics[key] = value
    const fast = nominal[key]
    if (typeof value === 'number' && typeof fast === 'number') {
      agreement[key] = fast === 0 ? Math.abs(value) : (value - fast) / Math.abs(fast)
      if (allowance[key] !== undefined) {
        stated[key] = allowance[key]
        withinTolerance = (withinTolerance ?? true) && Math.abs(value - fast) <= allowance[key]
      }
    }
  }
  const flipped = typeof exact.bistable === 'boolean' && typeof nominal.bistable === 'boolean' && exact.bistable !== nominal.bistable
  if (typeof exact.bistable === 'boolean') metrics.bistable = exact.bistable
  // a flipped flag is a disagreement whatever the numbers say
  if (withinTolerance !== undefined && flipped) withinTolerance = false

  // the band: nominal, the wall corners, and the modulus corners of each by scaling
  const tSigns = tolerance.thickness > 0 && walls.length ? [0, -1, 1] : [0]
  const eFactors = tolerance.modulus > 0
    ? [-1, 1].map((s) => Math.min(MODULUS_RANGE[1], Math.max(MODULUS_RANGE[0], material.modulus * (1 + s * tolerance.modulus))) / material.modulus)
    : []
  let band: Band | null = null
  let cornerError: string | null = null
  if (fastBand) {
    band = { low: { ...exact }, high: { ...exact } }
    for (const k of keys) {
      const lo = fastBand.low[k], hi = fastBand.high[k], f = nominal[k], e = exact[k]
      if (typeof lo === 'number' && typeof hi === 'number' && typeof f === 'number' && typeof e === 'number') {
        band.low[k] = Math.min(e, lo + (e - f))
        band.high[k] = Math.max(e, hi + (e - f))
      }
    }
  }
  for (const ts of fastBand ? [] : tSigns) {
    let at = exact
    if (ts !== 0) {
      const shifted = { ...params }
      for (const w of walls) shifted[w.key] = Math.min(w.max, Math.max(w.min, params[w.key] + ts * tolerance.thickness))
      try {
        at = run(shifted)
      } catch (e) {
        cornerError = (e as Error).message
        break
      }
    }
    band = foldInto(band, keys, at)
    for (const f of eFactors) {
      const scaled: Record<string, MetricValue> = { ...at }
      for (const k of keys) if (power(k) === 1 && typeof at[k] === 'number') scaled[k] = (at[k] as number) * f
      band = foldInto(band, keys, scaled)
    }
  }
  const verdictStated = withinTolerance === undefined ? {} : { tolerance: stated, withinTolerance }
  const base: Confirmation = { method, metrics, agreement, ...verdictStated, ...(uncertain.length ? { uncertain } : {}) }
  if (cornerError !== null || !band) {
    return { confirmation: { ...base, error: `at a tolerance corner: ${cornerError}` }, contradiction: `the exact method could not follow the path at a tolerance corner (${cornerError})` }
  }
  const score = scoreBand(compiled, band.low, band.high)
  const sf = band.low.safetyFactor
  const strainOk = typeof sf !== 'number' || strainHolds(sf, layout?.keys ?? [])
  const exactBand: Record<string, [number, number] | null> = {}
  for (const k of compiled.metrics) {
    const lo = band.low[k], hi = band.high[k]
    exactBand[k] = typeof lo === 'number' && typeof hi === 'number' ? [lo, hi] : null
  }
  const confirmation: Confirmation = { ...base, band: exactBand, margin: score.margin }
  let contradiction: string | null = null
  if (flipped) {
    contradiction = nominal.bistable ? 'the exact method finds that it springs back (not bistable), where the fast estimate said it holds' : 'the exact method finds it bistable, where the fast estimate said it springs back'
  } else if (score.margin < 0) {
    contradiction = score.binding === -2
      ? 'the exact method finds no second stable position over the whole tolerance band'
      : `the exact method puts ${compiled.bounds[score.binding].id} outside the window over the tolerance band (margin ${pct(score.margin)})`
  } else if (!strainOk) {
    contradiction = `the exact method finds the strain over the material's limit at a tolerance corner (safety factor ${Number((sf as number).toPrecision(3))})`
  }
  confirmation.verdict = judge(window, exact).verdict
  return { confirmation, contradiction }
}
