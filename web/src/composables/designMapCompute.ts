/**
 * The design map's computation: each cell is estimated with the family's fast estimator
 * (closed forms, or the bistable table) and, when a force window is given, judged over the
 * tolerance band exactly as search judges candidates. Pure: the web worker runs it, tests
 * call it directly. Families are found through the catalog's registry, so a family's folder
 * is all the map needs of it.
 */
import { getFamily } from '@catalog/registry'
import { dedicatedEstimatorFor } from '@catalog/search/estimators'
import { CandidateJudge, type CandidateContext } from '@catalog/search/candidate'
import { resolveTolerance } from '@catalog/tolerance/defaults'
import { compileWindow, parseWindow } from '@catalog/window'
import type { FamilyDefinition, FastEstimator, MetricValue } from '@catalog/schema/types'
import { DESIGN_MAP_SIZE, linspace, type CellState, type DesignMap, type DesignMapRequest } from './designMap'

export function familyOf(id: string): FamilyDefinition {
  return getFamily(id)
}

/** The family's fast estimator: its folder's own, or search's dedicated one; the map needs one. */
export function mapEstimatorOf(family: FamilyDefinition): FastEstimator {
  const estimator = family.search?.estimator ?? dedicatedEstimatorFor(family)
  if (!estimator) throw new Error(`the design map has no fast estimator for the family "${family.id}"`)
  return estimator
}

function windowJudge(family: FamilyDefinition, estimator: FastEstimator, req: DesignMapRequest): CandidateJudge | null {
  if (!req.window) return null
  const window = parseWindow(req.window, { materialIds: [] as string[] })
  const compiled = compileWindow(window)
  const ctx: CandidateContext = {
    family,
    estimator,
    modulus: req.modulus,
    strainLimit: req.strainLimit,
    bending: req.bending,
    tolerance: resolveTolerance(window.tolerance),
    compiled,
    // the map shows the feel over the two parameters; the footprint is search's business
    footprint: undefined,
    walls: family.params.filter((p) => p.role === 'wall').map((p) => ({ key: p.key, min: p.min, max: p.max })),
  }
  return new CandidateJudge(ctx, [...compiled.metrics, 'bistable'])
}

export function computeDesignMap(req: DesignMapRequest): DesignMap {
  const started = performance.now()
  const size = req.size ?? DESIGN_MAP_SIZE
  const family = familyOf(req.familyId)
  const estimator = mapEstimatorOf(family)
  const judge = windowJudge(family, estimator, { ...req, window: req.window && typeof req.window === 'object' ? { ...(req.window as object), materials: undefined } : req.window })
  const xs = linspace(req.x.min, req.x.max, size)
  const ys = linspace(req.y.min, req.y.max, size)
  // only what the fast estimate gives: a metric read off the exact curve (the largest force, say)
  // has no value here, and offering it would colour nothing
  const estimated = estimator.layout ? new Set(estimator.layout.keys) : null
  const numeric = family.metrics.filter((m) => m.unit !== 'boolean' && (!estimated || estimated.has(m.key))).map((m) => m.key)
  const values: Record<string, Array<number | null>> = Object.fromEntries(numeric.map((k) => [k, new Array(size * size).fill(null)]))
  const state: CellState[] = new Array(size * size).fill('invalid')
  const meets: boolean[] = new Array(size * size).fill(false)
  const reasons: Array<string | null> = new Array(size * size).fill(null)
  const params = { ...req.params }
  for (let j = 0; j < size; j++) {
    for (let i = 0; i < size; i++) {
      const c = j * size + i
      params[req.x.key] = xs[i]
      params[req.y.key] = ys[j]
      if (family.rules.some((r) => r.check(params))) { reasons[c] = 'rules'; continue }
      let metrics: Record<string, MetricValue>
      try {
        metrics = estimator.estimate(params, req.modulus, req.strainLimit, req.bending)
      } catch {
        reasons[c] = 'model'
        continue
      }
      for (const k of numeric) {
        const v = metrics[k]
        values[k][c] = typeof v === 'number' && Number.isFinite(v) ? v : null
      }
      state[c] = metrics.bistable === false ? 'monostable' : 'ok'
      if (judge) {
        meets[c] = judge.judge(params)
        reasons[c] = judge.reason
      }
    }
  }
  return { size, xs, ys, values, state, meets, reasons, hasWindow: !!judge, elapsedMs: performance.now() - started }
}
