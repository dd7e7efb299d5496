/**
 * The shelf search (issue 6): for every released entry of the window's kind, in every
 * allowed material, sample the allowed ranges on printable increments, judge each candidate
 * with the fast estimator over the tolerance band, refine around the best with a local
 * coordinate search on the continuous parameters, rank, and confirm the top results with the
 * exact method. Written as a generator so one body serves a synchronous run (CLI, bench,
 * tests) and a cancellable, time-sliced asynchronous one (API, web worker).
 */
import { families as registry } from '../registry'
import { builtinMaterials } from '../materials'
import { printerRules, type PrinterRules } from '../printability'
import type { FamilyDefinition } from '../schema/types'
import { resolveTolerance } from '../tolerance'
import { compileWindow, DEFAULT_LIMIT, familyKindsForWindow, parseWindow, type CompiledWindow, type ForceWindow, type MetricBand } from '../window'
import { CandidateJudge, type CandidateContext, type CandidateScore } from './candidate'
import { exactCheck, uncertaintyOf } from './exact-check'
import { estimatorFor } from './estimators'
import { explainEmpty, type Tally } from './explain'
import { compareRankKeys, MARGIN_BUCKET, marginRank, rankKey, SAFETY_BUCKET, SAFETY_CAP, safetyRank } from './rank'
import { distinctAnswers } from './distinct'
import { refine } from './refine'
import { entryGrid, GridCursor, type Axis } from './sampling'
import { createShelfIndex, type ShelfTextIndex } from './text-index'
import type { CloseVariant, Confirmation, DroppedResult, RankKey, SearchAnswer, SearchMaterial, SearchOptions, SearchResult, Shelf, ShelfEntry } from './types'
import { describeResult } from './why'

/** Candidates sampled per entry and material when the options give no budget. */
export const DEFAULT_BUDGET = 6000
/** Results confirmed with the exact method when the options do not say. */
export const DEFAULT_CONFIRM = 5
/** Exact checks of uncertain estimates beyond the confirmed results, per search (each solves every wall corner exactly). */
export const UNCERTAIN_CHECKS = 4
/** Seeds per entry and material that the local search refines. */
export const REFINE_SEEDS = 3
/** Candidates between two checkpoints (progress, cancellation). */
const YIELD_EVERY = 1024

export class SearchCancelledError extends Error {
  constructor() {
    super('search cancelled')
    this.name = 'AbortError'
  }
}

export interface Unit {
  entry: ShelfEntry
  family: FamilyDefinition
  material: SearchMaterial
}

export interface Scored {
  unit: Unit
  params: Record<string, number>
  score: CandidateScore
  area: number
  volume: number
}

const now = () => (globalThis.performance?.now ? globalThis.performance.now() : Date.now())

function contextOf(unit: Unit, window: ForceWindow, compiled: CompiledWindow): CandidateContext {
  const { family, material } = unit
  return {
    family,
    estimator: estimatorFor(family),
    modulus: material.modulus,
    strainLimit: material.strainLimit,
    tolerance: resolveTolerance(window.tolerance),
    compiled,
    footprint: window.footprint,
    walls: family.params.filter((p) => p.role === 'wall').map((p) => ({ key: p.key, min: p.min, max: p.max })),
  }
}

function scored(unit: Unit, params: Record<string, number>, score: CandidateScore): Scored {
  const env = unit.family.envelope(params)
  return { unit, params: { ...params }, score, area: env.x * env.y, volume: env.x * env.y * env.z }
}

const rankOf = (s: Scored) => ({ windowMargin: s.score.windowMargin, safetyFactor: s.score.strainMargin === null ? null : s.score.strainMargin + 1, area: s.area, volume: s.volume })

/** Units to search and why the others were left out. */
function unitsOf(window: ForceWindow, shelf: Shelf, families: readonly FamilyDefinition[], materials: readonly SearchMaterial[], index: ShelfTextIndex | undefined, tally: Tally): Unit[] {
  const kinds = familyKindsForWindow[window.kind]
  let entries = shelf.filter((e) => e.status === 'released')
  tally.entries.released = entries.length
  entries = entries.filter((e) => {
    const family = families.find((f) => f.id === e.familyId)
    if (!family) { tally.notes.push(`entry "${e.name}" names the unknown family ${e.familyId}`); return false }
    return kinds.includes(family.kind)
  })
  tally.entries.ofKind = entries.length
  if (window.text?.trim()) {
    const hits = new Set((index ?? createShelfIndex(entries, families)).search(window.text).map((h) => String(h.entryId)))
    entries = entries.filter((e) => hits.has(String(e.id)))
    tally.entries.matchingText = entries.length
  }
  const units: Unit[] = []
  for (const entry of entries) {
    const family = families.find((f) => f.id === entry.familyId)!
    const own = entry.materials.length ? entry.materials : [typeof entry.defaultParams.material === 'string' ? entry.defaultParams.material : 'petg']
    const wanted = window.materials ? own.filter((m) => window.materials!.includes(m)) : own
    for (const id of wanted) {
      const material = materials.find((m) => m.id === id)
      if (material) units.push({ entry, family, material })
      else tally.notes.push(`entry "${entry.name}" lists the unknown material ${id}`)
    }
  }
  tally.entries.withMaterial = new Set(units.map((u) => u.entry.id)).size
  return units
}

function bandOf(compiled: CompiledWindow, score: CandidateScore): MetricBand {
  const band: MetricBand = {}
  for (const key of compiled.metrics) {
    const lo = score.low?.[key]
    const hi = score.high?.[key]
    band[key] = typeof lo === 'number' && typeof hi === 'number' ? [lo, hi] : null
  }
  return band
}

function* searchBody(window: ForceWindow, shelf: Shelf, options: SearchOptions & { index?: ShelfTextIndex }): Generator<void, SearchAnswer> {
  const started = now()
  const families = options.families ?? registry
  const materials = options.materials ?? builtinMaterials
  const rules: PrinterRules = printerRules(window.printer)
  const compiled = compileWindow(window)
  const keys = [...compiled.metrics, 'bistable']
  const limit = window.limit ?? DEFAULT_LIMIT
  const budget = options.budget ?? DEFAULT_BUDGET
  const tally: Tally = { entries: { released: 0, ofKind: 0, matchingText: null, withMaterial: 0 }, reasons: {}, unprintable: [], notes: [], nearest: null, considered: 0 }
  const units = unitsOf(window, shelf, families, materials, options.index, tally)
  const progress = (done: number, phase: 'sampling' | 'refining' | 'confirming' | 'done') =>
    options.onProgress?.({ done, total: units.length, considered: tally.considered, phase })

  const accepted: Scored[] = []
  // the best `limit` accepted so far over the units done (what bestOf(accepted) would keep);
  // with distinct answers every unit's best is listed whatever the others found, so a unit's
  // candidates are screened against its own list only
  const distinct = options.distinct !== false
  const best = new BestList(limit)
  for (let u = 0; u < units.length; u++) {
    const unit = units[u]
    const grid = entryGrid(unit.family, unit.entry, rules, budget)
    if (grid.problem) {
      // the same entry in another material is unprintable for the same reason: say it once
      const line = `${unit.entry.name}: ${grid.problem}`
      if (!tally.unprintable.includes(line)) tally.unprintable.push(line)
      continue
    }
    const ctx = contextOf(unit, window, compiled)
    const judge = new CandidateJudge(ctx, keys)
    const mine = new BestList(limit)
    const keep = new UnitKeeper(unit, judge)
    // rank key of the candidate the judge holds: the bands, then the envelope when needed
    let m = 0
    let sr = 0
    let area = 0
    let volume = 0
    const bands = () => {
      m = marginRank(judge.windowMargin)
      sr = safetyRank(judge.strainMargin === null ? null : judge.strainMargin + 1)
    }
    const envelope = (params: Record<string, number>) => {
      if (ctx.footprint) {
        area = judge.envelopeX * judge.envelopeY
        volume = area * judge.envelopeZ
      } else {
        const env = unit.family.envelope(params)
        area = env.x * env.y
        volume = env.x * env.y * env.z
      }
    }
    const offer = (params: Record<string, number>) => {
      bands()
      if (mine.outOnBands(m, sr)) return
      envelope(params)
      const at = mine.place(m, sr, area, volume, judge.windowMargin)
      if (at >= limit || mine.holds(at, params, m, sr, area, volume, judge.windowMargin)) return
      mine.insert(at, keep.scored(params), m, sr, area, volume)
    }
    /** Whether the candidate (bounded by the judge) could still enter this unit's list and the answer so far. */
    const couldRank = (params: Record<string, number>) => {
      bands()
      if (mine.outOnBands(m, sr) || (!distinct && best.outOnBands(m, sr))) return false
      envelope(params)
      return !(mine.full && mine.place(m, sr, area, volume, judge.windowMargin) >= limit) && !(!distinct && best.full && best.place(m, sr, area, volume, judge.windowMargin) >= limit)
    }
    const seeds: Scored[] = []
    // The judge holds the verdict of `params`; a Scored (records, envelope) is built only for
    // the few candidates kept: a seed, the nearest miss, or one of the unit's best.
    const consider = (params: Record<string, number>) => {
      tally.considered++
      keep.reset()
      if (judge.ok) offer(params)
      else {
        tally.reasons[judge.reason!] = (tally.reasons[judge.reason!] ?? 0) + 1
        if (!tally.nearest || judge.objective > tally.nearest.score.objective) tally.nearest = keep.scored(params)
      }
      if (seeds.length < REFINE_SEEDS || judge.objective > seeds[seeds.length - 1].score.objective) {
        const s = keep.scored(params)
        let at = seeds.length
        while (at > 0 && seeds[at - 1].score.objective < s.score.objective) at--
        seeds.splice(at, 0, s)
        if (seeds.length > REFINE_SEEDS) seeds.pop()
      }
    }
    let sinceYield = 0
    const cursor = new GridCursor(grid.axes)
    const params = cursor.params
    while (cursor.next()) {
      if (++sinceYield % YIELD_EVERY === 0) yield
      // Once this unit's list or the answer so far is full, and the seeds are, a candidate
      // whose nominal estimate bounds it out of the seeds and of a full list cannot change the
      // answer (its band only ranks it lower; the reasons and nearest miss only explain an
      // empty answer): it is counted, not banded.
      if (seeds.length >= REFINE_SEEDS && (mine.full || (!distinct && best.full))) {
        const couldBeOk = judge.bound(params)
        if (judge.objective <= seeds[seeds.length - 1].score.objective && (!couldBeOk || !couldRank(params))) {
          tally.considered++
          continue
        }
        judge.judgeBounded(params)
      } else judge.judge(params)
      consider(params)
    }
    progress(u + 0.5, 'refining')
    const continuous: Axis[] = grid.axes.filter((a) => a.kind === 'continuous' || a.kind === 'height')
    for (const seed of seeds) {
      if (options.refine === false || seed.score.objective === -Infinity || !continuous.length) continue
      const found = refine(judge, continuous, seed.params, seed.score, consider)
      if (found.ok) {
        judge.judge(found.params)
        keep.reset()
        offer(found.params)
      }
    }
    accepted.push(...mine.items)
    best.merge(mine)
    progress(u + 1, 'sampling')
    yield
  }

  // spares beyond the limit stand in for results the exact check drops
  const groups = distinct
    ? distinctAnswers(bestOf(accepted, accepted.length), 2 * limit, (s) => ({ group: `${s.unit.entry.id}|${s.unit.material.id}`, family: s.unit.family, params: s.params }))
    : bestOf(accepted, 2 * limit).map((lead) => ({ lead, tier: 1 as const, variants: [] as Scored[] }))
  const confirmCount = options.confirm ?? DEFAULT_CONFIRM
  const tolerance = resolveTolerance(window.tolerance)
  const results: SearchResult[] = []
  const dropped: DroppedResult[] = []
  let uncertainChecks = 0
  for (const group of groups) {
    if (results.length >= limit) break
    const s = group.lead
    const { reasons: uncertain, decisive } = uncertaintyOf(s.unit.family, s.params)
    let confirmed: Confirmation | null = null
    const confirming = results.length < confirmCount
    if (!confirming && decisive && uncertainChecks >= UNCERTAIN_CHECKS) {
      // never returned unchecked: past the budget of exact checks an uncertain estimate is left out
      dropped.push({ entryId: s.unit.entry.id, entryName: s.unit.entry.name, params: { ...s.params, material: s.unit.material.id }, reason: `its estimate is uncertain and this search's ${UNCERTAIN_CHECKS} exact checks of uncertain estimates are spent`, uncertain })
      continue
    }
    // the first results are confirmed; an estimate uncertain of itself in a way that can change
    // the verdict is judged exactly wherever it ranks
    if (confirming || decisive) {
      if (!confirming) uncertainChecks++
      progress(units.length, 'confirming')
      const check = exactCheck(window, compiled, s.unit.family, s.unit.material, s.params, s.score.nominal ?? {}, tolerance, materials, uncertain,
        decisive || !s.score.low || !s.score.high ? null : { low: s.score.low, high: s.score.high })
      yield
      if (check.contradiction) {
        dropped.push({ entryId: s.unit.entry.id, entryName: s.unit.entry.name, params: { ...s.params, material: s.unit.material.id }, reason: check.contradiction, uncertain })
        continue
      }
      confirmed = check.confirmation
    }
    const band = bandOf(compiled, s.score)
    const env = s.unit.family.envelope(s.params)
    results.push({
      entryId: s.unit.entry.id,
      entryName: s.unit.entry.name,
      family: s.unit.family.id,
      params: { ...s.params, material: s.unit.material.id },
      metrics: s.score.nominal ?? {},
      band,
      margin: s.score.windowMargin,
      safetyFactor: s.score.strainMargin === null ? null : s.score.strainMargin + 1,
      method: estimatorFor(s.unit.family).method,
      uncertain,
      confirmed,
      why: describeResult(results.length + 1, window, band, s.score, env, s.unit.material, confirmed),
      ...(distinct ? { rank: rankKeyOf(s, group.tier), closeVariants: group.variants.map(variantOf) } : {}),
    })
  }
  progress(units.length, 'done')
  const elapsedMs = now() - started
  const tol = resolveTolerance(window.tolerance)
  const explanation = results.length
    ? `${results.length} configuration${results.length === 1 ? '' : 's'} from ${new Set(results.map((r) => r.entryId)).size} entr${new Set(results.map((r) => r.entryId)).size === 1 ? 'y' : 'ies'} keep the whole tolerance band (walls ±${tol.thickness} mm, modulus ±${Math.round(tol.modulus * 100)} %) inside the window and the strain under the material's limit; ${tally.considered} candidates estimated. Ranked by margin to the window's edges over the band, then strain safety, footprint and envelope volume (a print-time proxy).${distinct ? ` The best design of each entry and material is listed first, then further designs that differ by more than a step and 3 % in some parameter; ${foldedText(groups)}` : ''}${tally.unprintable.length ? ` Not printable on this printer: ${tally.unprintable.join('; ')}.` : ''} Predicted forces are estimates to be confirmed on printed parts.`
    : explainEmpty(window, compiled, tally, rules)
  return { results, considered: tally.considered, elapsedMs, explanation: explanation + droppedSentence(dropped), dropped }
}

/** The sort key as applied, in readable numbers (rank.ts's bands). */
function rankKeyOf(s: Scored, tier: 1 | 2): RankKey {
  const r = rankOf(s)
  const m = -marginRank(r.windowMargin)
  const sr = -safetyRank(r.safetyFactor)
  const safetyBand: [number, number] | null = r.safetyFactor === null || r.safetyFactor >= SAFETY_CAP ? null : [sr * SAFETY_BUCKET, (sr + 1) * SAFETY_BUCKET].map((v) => Number(v.toFixed(6))) as [number, number]
  return {
    tier,
    marginBand: [m * MARGIN_BUCKET, (m + 1) * MARGIN_BUCKET].map((v) => Number(v.toFixed(6))) as [number, number],
    safetyBand,
    footprint: r.area,
    volume: r.volume,
  }
}

function variantOf(s: Scored): CloseVariant {
  return { params: { ...s.params, material: s.unit.material.id }, margin: s.score.windowMargin, safetyFactor: s.score.strainMargin === null ? null : s.score.strainMargin + 1 }
}

function foldedText(groups: { variants: Scored[] }[]): string {
  const folded = groups.reduce((n, g) => n + g.variants.length, 0)
  return folded ? `${folded} close variant${folded === 1 ? '' : 's'} (within a step or 3 % on every parameter) fold under them.` : 'none of them is a close variant of another.'
}

/**
 * The n best by rank, each parameter set once, kept as candidates are offered: the same as
 * bestOf over every candidate in the order offered (the sort is stable, so of equal keys the
 * earlier stays ahead, and a repeated parameter set has an equal key), without holding them
 * all. Keys are rankKey's four numbers, then the window margin.
 */
class BestList {
  readonly items: Scored[] = []
  /** The rank keys of the items, four numbers each (rankKey). */
  readonly keys: Float64Array

  constructor(readonly n: number) {
    this.keys = new Float64Array(4 * (n + 1))
  }

  get full(): boolean {
    return this.items.length >= this.n
  }

  /** A full list whose worst item already ranks ahead on the margin and safety bands alone. */
  outOnBands(m: number, s: number): boolean {
    const o = 4 * (this.items.length - 1)
    return this.items.length >= this.n && (m > this.keys[o] || (m === this.keys[o] && s > this.keys[o + 1]))
  }

  /** The place a stable sort gives this key, after every item that does not rank below it; n or more: it does not enter. */
  place(m: number, s: number, area: number, volume: number, windowMargin: number): number {
    const { items, keys } = this
    let at = items.length
    while (at > 0) {
      const o = 4 * (at - 1)
      const d = keys[o] !== m ? keys[o] - m : keys[o + 1] !== s ? keys[o + 1] - s : keys[o + 2] !== area ? keys[o + 2] - area : keys[o + 3] !== volume ? keys[o + 3] - volume : windowMargin - items[at - 1].score.windowMargin
      if (!(d > 0)) break
      at--
    }
    return at
  }

  /** Whether the same parameter set sits just ahead of `at` among the equal keys (where a repeat would be). */
  holds(at: number, params: Record<string, number>, m: number, s: number, area: number, volume: number, windowMargin: number): boolean {
    for (let i = at - 1; i >= 0 && sameRank(this.keys, i, m, s, area, volume) && this.items[i].score.windowMargin === windowMargin; i--) {
      if (sameParams(this.items[i].params, params)) return true
    }
    return false
  }

  insert(at: number, item: Scored, m: number, s: number, area: number, volume: number): void {
    const { items, keys } = this
    keys.copyWithin(4 * (at + 1), 4 * at, 4 * items.length)
    items.splice(at, 0, item)
    keys[4 * at] = m
    keys[4 * at + 1] = s
    keys[4 * at + 2] = area
    keys[4 * at + 3] = volume
    if (items.length > this.n) items.pop()
  }

  /** Merges another list's items after this one's (a later unit's): bestOf over the concatenation. */
  merge(other: BestList): void {
    for (let i = 0; i < other.items.length; i++) {
      const o = 4 * i
      const item = other.items[i]
      const k = other.keys
      const at = this.place(k[o], k[o + 1], k[o + 2], k[o + 3], item.score.windowMargin)
      if (at < this.n) this.insert(at, item, k[o], k[o + 1], k[o + 2], k[o + 3])
    }
  }
}

function sameRank(keys: Float64Array, i: number, m: number, s: number, area: number, volume: number): boolean {
  const o = 4 * i
  return keys[o] === m && keys[o + 1] === s && keys[o + 2] === area && keys[o + 3] === volume
}

/** Equal numbers under every key: what equal JSON means for finite parameter values. */
function sameParams(a: Record<string, number>, b: Record<string, number>): boolean {
  for (const key in b) if (a[key] !== b[key]) return false
  return true
}

/**
 * Builds the Scored of the candidate being considered at most once, from the judge's raw
 * numbers; no closure per candidate.
 */
class UnitKeeper {
  private params: Record<string, number> | null = null
  private kept: Scored | null = null

  constructor(private readonly unit: Unit, private readonly judge: CandidateJudge) {}

  /** Starts a new candidate. */
  reset(): void {
    this.params = null
    this.kept = null
  }

  /** The Scored of `params`, which the judge has just judged. */
  scored(params: Record<string, number>): Scored {
    if (this.kept && this.params === params) return this.kept
    this.params = params
    this.kept = scored(this.unit, params, this.judge.scoreJudged())
    return this.kept
  }
}

/** The n best by rank, each parameter set once. */
/** The explanation's sentence on results the exact check dropped (empty when none was). */
function droppedSentence(dropped: DroppedResult[]): string {
  if (!dropped.length) return ''
  const named = dropped.slice(0, 3).map((d) => `${d.entryName}: ${d.reason}${d.uncertain.length ? ` (the estimate was marked uncertain: ${d.uncertain.join(', ')})` : ''}`)
  return ` ${dropped.length} configuration${dropped.length === 1 ? ' was' : 's were'} dropped because the exact method contradicts the fast estimate — ${named.join('; ')}${dropped.length > 3 ? `; and ${dropped.length - 3} more` : ''}.`
}

function bestOf(list: Scored[], n: number): Scored[] {
  const keyed = list.map((s) => ({ s, key: rankKey(rankOf(s)) }))
  keyed.sort((a, b) => compareRankKeys(a.key, b.key, a.s.score.windowMargin, b.s.score.windowMargin))
  const seen = new Set<string>()
  const out: Scored[] = []
  for (const { s } of keyed) {
    const id = `${s.unit.entry.id}|${s.unit.material.id}|${JSON.stringify(s.params)}`
    if (seen.has(id)) continue
    seen.add(id)
    out.push(s)
    if (out.length === n) break
  }
  return out
}

function prepare(rawWindow: unknown, options: SearchOptions): ForceWindow {
  const ids = (options.materials ?? builtinMaterials).map((m) => m.id)
  return parseWindow(rawWindow, { materialIds: ids })
}

/** Runs the search to the end on the calling thread (CLI, benchmark, tests). */
export function searchShelfSync(rawWindow: unknown, shelf: Shelf, options: SearchOptions & { index?: ShelfTextIndex } = {}): SearchAnswer {
  const window = prepare(rawWindow, options)
  const body = searchBody(window, shelf, options)
  for (;;) {
    if (options.signal?.aborted) throw new SearchCancelledError()
    const step = body.next()
    if (step.done) return step.value
  }
}

/** Slice of work between two yields to the event loop in the asynchronous run, ms. */
export const TIME_SLICE_MS = 15

const macrotask = () => new Promise<void>((resolve) => (typeof setImmediate === 'function' ? setImmediate(resolve) : setTimeout(resolve, 0)))

/**
 * The same search, yielding to the event loop every TIME_SLICE_MS so that progress can be
 * reported and `signal` can cancel it (rejects with an AbortError).
 */
export async function searchShelf(rawWindow: unknown, shelf: Shelf, options: SearchOptions & { index?: ShelfTextIndex } = {}): Promise<SearchAnswer> {
  const window = prepare(rawWindow, options)
  const body = searchBody(window, shelf, options)
  let sliceStart = now()
  for (;;) {
    if (options.signal?.aborted) throw new SearchCancelledError()
    const step = body.next()
    if (step.done) return step.value
    if (now() - sliceStart > TIME_SLICE_MS) {
      await macrotask()
      sliceStart = now()
    }
  }
}
