/**
 * Interpolation in the normalised table (see table-build.ts for its groups): Catmull–Rom cubic
 * along Q and ln η, where the metrics are smooth (measured on direct solves: it cuts the 90th
 * percentile of the error along η tenfold against linear), and linear along the post axis w,
 * where the metrics have corners (the peak's corner meeting a limit point, the second position
 * passing the end of travel) that a cubic would overshoot. Quadratic in the edge cells of Q and
 * η; trilinear where a cubic's outer node was not computed. No allocation per call, so search
 * can scan millions of candidates.
 */
import type { MetricValue } from '../../schema/types'
import { TABLE_METRICS } from './table-build'
import { bistableTable, type BistableTable } from './table-store'

const METRICS = TABLE_METRICS.length

/** The dimensionless groups of a parameter set: Q, η and the post group w (table-build.ts). */
export function tableCoordinates(span: number, apexHeight: number, thickness: number, postLength: number): { q: number; eta: number; w: number } {
  const slenderness = span / thickness
  return { q: apexHeight / thickness, eta: apexHeight / span, w: (postLength / span) * Math.cbrt(slenderness * slenderness) }
}

const cell = new Int32Array(3)
const frac = new Float64Array(3)

/**
 * Per table: the spacing of each axis where it is even (NaN where not), so that a cell is
 * found by one division and a check of its two ends instead of a binary search, and the
 * strides of the node-major values. Made once per table.
 */
interface Lookup { qStep: number; etaStep: number; wStep: number; strideQ: number; strideEta: number }
const lookups = new WeakMap<BistableTable, Lookup>()

function evenStep(axis: Float64Array): number {
  if (axis.length < 2) return NaN
  const step = (axis[axis.length - 1] - axis[0]) / (axis.length - 1)
  for (let i = 1; i < axis.length; i++) if (Math.abs(axis[i] - axis[i - 1] - step) > 1e-9 * Math.abs(step)) return NaN
  return step
}

function lookupOf(t: BistableTable): Lookup {
  let l = lookups.get(t)
  if (!l) {
    l = { qStep: evenStep(t.q), etaStep: evenStep(t.logEta), wStep: evenStep(t.w), strideQ: t.logEta.length * t.w.length * METRICS, strideEta: t.w.length * METRICS }
    lookups.set(t, l)
  }
  return l
}

/**
 * Finds the cell of v on axis k — the last node at or below v, at most the last but one —
 * false outside the axis. On an evenly spaced axis (step not NaN) the guess from the step is
 * moved to that node by comparing with the nodes themselves, so the cell is the one a binary
 * search finds, to the bit.
 */
function locate(axis: Float64Array, v: number, k: number, step = NaN): boolean {
  const n = axis.length
  if (!(v >= axis[0] - 1e-12 && v <= axis[n - 1] + 1e-12)) return false
  let lo: number
  if (step === step) {
    lo = Math.floor((v - axis[0]) / step)
    if (lo < 0) lo = 0
    else if (lo > n - 2) lo = n - 2
    while (lo > 0 && v < axis[lo]) lo--
    while (lo < n - 2 && v >= axis[lo + 1]) lo++
  } else {
    lo = 0
    let hi = n - 1
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1
      if (v >= axis[mid]) lo = mid
      else hi = mid
    }
  }
  const t = (v - axis[lo]) / (axis[lo + 1] - axis[lo])
  cell[k] = lo
  frac[k] = t < 0 ? 0 : t > 1 ? 1 : t
  return true
}

/**
 * Weights of nodes lo−1 … lo+2 at fraction t of cell lo on an evenly spaced axis of n nodes
 * (written to w[o … o+3]): Catmull–Rom inside, the quadratic through the three nearest nodes
 * in the first and last cells, linear when the axis has two nodes.
 */
function cubicWeights(lo: number, n: number, t: number, w: Float64Array, o: number): void {
  const t2 = t * t, t3 = t2 * t
  if (n < 3) {
    w[o] = 0; w[o + 1] = 1 - t; w[o + 2] = t; w[o + 3] = 0
  } else if (lo === 0) {
    w[o] = 0; w[o + 1] = 0.5 * (t - 1) * (t - 2); w[o + 2] = -t * (t - 2); w[o + 3] = 0.5 * t * (t - 1)
  } else if (lo + 2 > n - 1) {
    w[o] = 0.5 * t * (t - 1); w[o + 1] = (1 - t) * (1 + t); w[o + 2] = 0.5 * t * (t + 1); w[o + 3] = 0
  } else {
    w[o] = 0.5 * (-t3 + 2 * t2 - t); w[o + 1] = 0.5 * (3 * t3 - 5 * t2 + 2); w[o + 2] = 0.5 * (-3 * t3 + 4 * t2 + t); w[o + 3] = 0.5 * (t3 - t2)
  }
}

const wq = new Float64Array(4)
const we = new Float64Array(4)
const acc = new Float64Array(METRICS)

/**
 * Fills `out` (one slot per TABLE_METRICS entry) with interpolated normalised metrics;
 * returns false outside the table or where a surrounding node was not computed or failed.
 */
export function interpolateTable(q: number, eta: number, w: number, out: Float64Array, table: BistableTable = bistableTable()): boolean {
  const o = interpolated(q, eta, w, table)
  if (o < 0) return false
  for (let m = 0; m < METRICS; m++) out[m] = memoValues[o + m]
  return true
}

/**
 * interpolateTable's answer left in the memo: the offset of its metrics in memoValues (valid
 * until the next call), or −1 outside the table. Search asks for the same point many times over
 * (every print height of a beam, and the band's corners): the last answers are kept by their
 * exact inputs, so a repeat is a lookup, and the caller reads the slots it needs in place.
 */
function interpolated(q: number, eta: number, w: number, table: BistableTable): number {
  if (memoTable !== table) {
    memoTable = table
    // made on the first lookup (5 MB), not when the module loads: a browser that imports the family never asks
    if (memoState.length === 0) { memoKeys = new Float64Array(3 * MEMO_SLOTS); memoValues = new Float64Array(METRICS * MEMO_SLOTS); memoState = new Uint8Array(MEMO_SLOTS) }
    memoState.fill(0)
  }
  const h = memoSlot(q, eta, w)
  const k = 3 * h
  const o = METRICS * h
  if (memoState[h] !== 0 && memoKeys[k] === q && memoKeys[k + 1] === eta && memoKeys[k + 2] === w) return memoState[h] === 2 ? -1 : o
  const ok = interpolateUncached(q, eta, w, memoValues, o, table)
  memoKeys[k] = q; memoKeys[k + 1] = eta; memoKeys[k + 2] = w
  memoState[h] = ok ? 1 : 2
  return ok ? o : -1
}

/**
 * Answers kept by interpolateTable (a power of two): direct-mapped by a hash of the inputs' bits.
 * A 2,000-entry search asks about 1.1 million times for some 25,000 points: 4,096 slots missed
 * one ask in eight (each miss evicting a point asked again later), 65,536 one in forty-five.
 */
const MEMO_SLOTS = 65536
let memoKeys = new Float64Array(0)
let memoValues = new Float64Array(0)
/** 0 empty, 1 an answer, 2 outside the table. */
let memoState = new Uint8Array(0)
let memoTable: BistableTable | null = null
const memoBits = new Float64Array(3)
const memoWords = new Int32Array(memoBits.buffer)

function memoSlot(q: number, eta: number, w: number): number {
  memoBits[0] = q; memoBits[1] = eta; memoBits[2] = w
  let x = 0x811c9dc5
  for (let i = 0; i < 6; i++) x = Math.imul(x ^ memoWords[i], 0x01000193)
  return (x ^ (x >>> 15)) & (MEMO_SLOTS - 1)
}

/** The interpolation itself, into out[o … o + METRICS − 1] (which may be left partly written when it returns false). */
function interpolateUncached(q: number, eta: number, w: number, out: Float64Array, o: number, table: BistableTable): boolean {
  const t = table
  const look = lookupOf(t)
  if (!(eta > 0) || !locate(t.q, q, 0, look.qStep) || !locate(t.logEta, Math.log(eta), 1, look.etaStep) || !locate(t.w, w, 2, look.wStep)) return false
  const nq = t.q.length, ne = t.logEta.length
  const strideQ = look.strideQ, strideEta = look.strideEta
  const iq = cell[0], ie = cell[1], iw = cell[2], fw = frac[2]
  cubicWeights(iq, nq, frac[0], wq, 0)
  cubicWeights(ie, ne, frac[1], we, 0)
  const v = t.values
  for (let m = 0; m < METRICS; m++) acc[m] = 0
  for (let a = 0; a < 4; a++) {
    const wa = wq[a]
    if (wa === 0) continue
    const jq = iq - 1 + a
    for (let b = 0; b < 4; b++) {
      const wab = wa * we[b]
      if (wab === 0) continue
      const base = jq * strideQ + (ie - 1 + b) * strideEta + iw * METRICS
      const w0 = wab * (1 - fw), w1 = wab * fw
      // a zero weight must not multiply a node that was not computed (NaN)
      if (w1 === 0) for (let m = 0; m < METRICS; m++) acc[m] += w0 * v[base + m]
      else if (w0 === 0) for (let m = 0; m < METRICS; m++) acc[m] += w1 * v[base + METRICS + m]
      else for (let m = 0; m < METRICS; m++) acc[m] += w0 * v[base + m] + w1 * v[base + METRICS + m]
    }
  }
  let finite = true
  for (let m = 0; m < METRICS; m++) if (!Number.isFinite(acc[m])) { finite = false; break }
  if (finite) {
    for (let m = 0; m < METRICS; m++) out[o + m] = acc[m]
    return true
  }
  // a cubic's outer node is missing (the edge of the valid groups): trilinear on the cell
  const fq = frac[0], fe = frac[1]
  for (let m = 0; m < METRICS; m++) acc[m] = 0
  for (let a = 0; a < 2; a++) for (let b = 0; b < 2; b++) {
    const wab = (a ? fq : 1 - fq) * (b ? fe : 1 - fe)
    const base = (iq + a) * strideQ + (ie + b) * strideEta + iw * METRICS
    if (wab === 0) continue
    for (let m = 0; m < METRICS; m++) acc[m] += wab * (fw === 1 ? v[base + METRICS + m] : fw === 0 ? v[base + m] : (1 - fw) * v[base + m] + fw * v[base + METRICS + m])
  }
  for (let m = 0; m < METRICS; m++) {
    if (!Number.isFinite(acc[m])) return false
    out[o + m] = acc[m]
  }
  return true
}

/** Slots of the table's metrics, as constants (a lookup by name per call costs more than the arithmetic around it). */
const slotOf = (k: (typeof TABLE_METRICS)[number]) => TABLE_METRICS.indexOf(k)
const SLOT_PEAK = slotOf('peak'), SLOT_VALLEY = slotOf('valley'), SLOT_UNSTABLE_AT = slotOf('unstableAt'), SLOT_SECOND_AT = slotOf('secondAt')
const SLOT_WORK_IN = slotOf('workIn'), SLOT_BARRIER = slotOf('barrier'), SLOT_STRAIN = slotOf('strain')

/**
 * estimateFromTable on raw numbers, for search: writes into `out` in the slot order
 * peakForce, valleyForce, unstablePosition, secondStablePosition, energyIn, energyBarrier,
 * bistable (1/0), maxStrain, strainLimit, safetyFactor — NaN for an empty metric — and
 * returns false outside the table. No object per call; the same arithmetic as the record form
 * (which is built on it), so the two agree to the bit.
 */
export function fillFromTable(table: BistableTable, span: number, h: number, thickness: number, depth: number, postLength: number, modulus: number, strainLimit: number, out: Float64Array): boolean {
  const slenderness = span / thickness
  // no post: w is 0 whatever the slenderness (the cube root, the costliest step here, skipped); else
  // the root of the last slenderness is reused, as search walks the post length innermost
  const w = postLength === 0 ? 0 : (postLength / span) * cbrtOfSquare(slenderness)
  const o = interpolated(h / thickness, h / span, w, table)
  if (o < 0) return false
  const v = memoValues
  // cubes as products, not ** 3: the power costs several times as much here and differs only in the last bit
  const scale = (2 * modulus * ((depth * (thickness * thickness * thickness)) / 12) * h) / (span * span * span)
  const valley = v[o + SLOT_VALLEY] * scale
  const bistable = valley < 0
  const secondAt = v[o + SLOT_SECOND_AT]
  const reachesSecond = bistable && secondAt < 2 - 1e-9
  const maxStrain = v[o + SLOT_STRAIN] * ((thickness * h) / (span * span))
  out[0] = v[o + SLOT_PEAK] * scale
  out[1] = valley
  out[2] = bistable ? v[o + SLOT_UNSTABLE_AT] * h : NaN
  out[3] = reachesSecond ? secondAt * h : NaN
  out[4] = bistable ? v[o + SLOT_WORK_IN] * scale * h : NaN
  out[5] = reachesSecond ? v[o + SLOT_BARRIER] * scale * h : NaN
  out[6] = bistable ? 1 : 0
  out[7] = maxStrain
  out[8] = strainLimit
  out[9] = strainLimit / maxStrain
  return true
}

let lastSlenderness = NaN
let lastRoot = NaN

/** ∛(s²), the last answer kept. */
function cbrtOfSquare(s: number): number {
  if (s !== lastSlenderness) { lastSlenderness = s; lastRoot = Math.cbrt(s * s) }
  return lastRoot
}

const slots = new Float64Array(10)
const orNull = (v: number) => (Number.isNaN(v) ? null : v)

/**
 * The family's metrics (keys and units of the nonlinear-fe evaluation) from `table`, or null
 * outside it. Monostable parts get no unstable position or energies, as the model reports them.
 */
export function estimateFromTable(
  table: BistableTable,
  p: { span: number; apexHeight: number; thickness: number; depth: number; postLength: number },
  material: { modulus: number; strainLimit: number },
): Record<string, MetricValue> | null {
  if (!fillFromTable(table, p.span, p.apexHeight, p.thickness, p.depth, p.postLength, material.modulus, material.strainLimit, slots)) return null
  return {
    peakForce: slots[0],
    valleyForce: slots[1],
    unstablePosition: orNull(slots[2]),
    secondStablePosition: orNull(slots[3]),
    energyIn: orNull(slots[4]),
    energyBarrier: orNull(slots[5]),
    bistable: slots[6] === 1,
    maxStrain: slots[7],
    strainLimit: slots[8],
    safetyFactor: slots[9],
  }
}
