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
import { DEFAULT_WIDE_BEAM, type WideBeamMode } from '../mechanics/wide-beam'
import { poissonRatioOf } from '../schema/validate'
import { printerRules, type PrinterRules } from '../printability'
import type { FamilyDefinition } from '../schema/types'
import { resolveTolerance } from '../tolerance'
import { compileWindow, DEFAULT_LIMIT, familyKindsForWindow, parseWindow, type CompiledWindow, type ForceWindow, type MetricBand } from '../window'
import { boxCorners, CandidateJudge, type CandidateContext, type CandidateScore } from './candidate'
import { exactCheck, uncertaintyOf } from './exact-check'
import { estimatorFor } from './estimators'
import { explainEmpty, type Tally } from './explain'
import { MARGIN_BUCKET, marginRank, SAFETY_BUCKET, SAFETY_CAP, safetyRank } from './rank'
import { BestList, bestOf, rankOf, UnitKeeper, type Scored, type Unit } from './best-list'
import { distinctAnswers, type DistinctGroup } from './distinct'
import { refine } from './refine'
import { entryGrid, gridSize, type Axis } from './sampling'
import { createShelfIndex, type ShelfTextIndex } from './text-index'
import type { CloseVariant, Confirmation, DroppedResult, RankKey, SearchAnswer, SearchMaterial, SearchOptions, SearchResult, Shelf } from './types'
import { describeResult } from './why'

/** Candidates sampled per entry and material when the options give no budget. */
const DEFAULT_BUDGET = 6000
/** Results confirmed with the exact method when the options do not say. */
const DEFAULT_CONFIRM = 5
/** Exact checks of uncertain estimates beyond the confirmed results, per search (each solves every wall corner exactly). */
const UNCERTAIN_CHECKS = 4
/** Seeds per entry and material that the local search refines. */
const REFINE_SEEDS = 3
/** Candidates between two checkpoints (progress, cancellation). */
const YIELD_EVERY = 1024

export class SearchCancelledError extends Error {
  constructor() {
    super('search cancelled')
    this.name = 'AbortError'
  }
}

const now = () => (globalThis.performance?.now ? globalThis.performance.now() : Date.now())

type Phase = 'sampling' | 'refining' | 'confirming' | 'done'

/** Where the grid walk is in a box (UnitSearch.walk): not yet looked at, its first half walked, walking its values. */
const BoxStep = { Enter: 0, SecondHalf: 1, Values: 2 } as const

/** What every step of one search reads and adds to: the window, its limits, the units, the tally and the kept candidates. */
interface SearchRun {
  readonly started: number
  readonly window: ForceWindow
  readonly compiled: CompiledWindow
  /** The metric keys judged: the window's, and whether the part is bistable. */
  readonly keys: string[]
  readonly limit: number
  readonly budget: number
  readonly rules: PrinterRules
  readonly materials: readonly SearchMaterial[]
  readonly distinct: boolean
  readonly options: SearchOptions
  readonly tally: Tally
  readonly units: Unit[]
  /** Every unit's best (its BestList's items), in unit order. */
  readonly accepted: Scored[]
  /**
   * The best `limit` accepted so far over the units done (what bestOf(accepted) would keep);
   * with distinct answers every unit's best is listed whatever the others found, so a unit's
   * candidates are screened against its own list only.
   */
  readonly best: BestList
  /**
   * With distinct answers: the leading design of every unit done, the best 2 × limit of them
   * (what the answer's groups are cut from). Once it is full, a unit none of whose designs
   * could enter it changes nothing in the answer (UnitSearch.probe).
   */
  readonly leads: BestList
  /** Whether candidates may be screened by bounds (SearchOptions.screen). */
  readonly screen: boolean
  progress(done: number, phase: Phase): void
}

/** Step 1: the window compiled, the units to search, and an empty tally. */
function startRun(window: ForceWindow, shelf: Shelf, options: SearchOptions & { index?: ShelfTextIndex }): SearchRun {
  const started = now()
  const families = options.families ?? registry
  const materials = options.materials ?? builtinMaterials
  const compiled = compileWindow(window)
  const limit = window.limit ?? DEFAULT_LIMIT
  const tally: Tally = { entries: { released: 0, ofKind: 0, matchingText: null, withMaterial: 0 }, reasons: {}, unprintable: [], notes: [], nearest: null, considered: 0 }
  const units = unitsOf(window, shelf, families, materials, options.index, tally)
  return {
    started, window, compiled, keys: [...compiled.metrics, 'bistable'], limit, budget: options.budget ?? DEFAULT_BUDGET,
    rules: printerRules(window.printer), materials, distinct: options.distinct !== false, options, tally, units,
    accepted: [], best: new BestList(limit), leads: new BestList(2 * limit), screen: options.screen !== false,
    progress: (done, phase) => options.onProgress?.({ done, total: units.length, considered: tally.considered, phase }),
  }
}

/** The wide-beam rule an entry's configurations get: its defaults' choice, else the default ('auto'). */
function wideBeamOf(unit: Unit): WideBeamMode {
  if (!unit.family.bendsBeams) return 'off'
  return unit.entry.defaultParams.wideBeam === 'off' ? 'off' : DEFAULT_WIDE_BEAM
}

function contextOf(unit: Unit, window: ForceWindow, compiled: CompiledWindow): CandidateContext {
  const { family, material } = unit
  return {
    family,
    estimator: estimatorFor(family),
    modulus: material.modulus,
    strainLimit: material.strainLimit,
    // the entry's wide-beam rule (its defaults may turn it off), as the exact check applies it
    bending: { poissonRatio: poissonRatioOf(material), wideBeam: wideBeamOf(unit) },
    tolerance: resolveTolerance(window.tolerance),
    compiled,
    footprint: window.footprint,
    walls: family.params.filter((p) => p.role === 'wall').map((p) => ({ key: p.key, min: p.min, max: p.max })),
  }
}

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

/** Step 2: every unit sampled, refined and its best kept (run.accepted, run.best). */
function* searchUnits(run: SearchRun): Generator<void> {
  let grid = run.units.length ? entryGrid(run.units[0].family, run.units[0].entry, run.rules, run.budget) : null
  for (let u = 0; u < run.units.length; u++) {
    const unit = run.units[u]
    // an entry's units (one per material) follow each other and share its grid, which the material does not change
    if (!grid || (u > 0 && run.units[u - 1].entry !== unit.entry)) grid = entryGrid(unit.family, unit.entry, run.rules, run.budget)
    if (grid.problem) {
      // the same entry in another material is unprintable for the same reason: say it once
      const line = `${unit.entry.name}: ${grid.problem}`
      if (!run.tally.unprintable.includes(line)) run.tally.unprintable.push(line)
      continue
    }
    let search = new UnitSearch(run, unit, grid.axes)
    if (search.probes()) {
      const considered = run.tally.considered
      if (!(yield* search.probe())) {
        // no design of this unit could lead one of the answer's groups: its candidates are counted, none kept
        run.progress(u + 1, 'sampling')
        yield
        continue
      }
      run.tally.considered = considered
      search = new UnitSearch(run, unit, grid.axes)
    }
    yield* search.sample()
    run.progress(u + 0.5, 'refining')
    search.refineSeeds()
    run.accepted.push(...search.mine.items)
    run.best.merge(search.mine)
    if (run.distinct) run.leads.merge(search.mine, 1)
    run.progress(u + 1, 'sampling')
    yield
  }
}

/**
 * One unit's search: the grid walk, each candidate considered (its verdict tallied, kept as a
 * seed, the nearest miss or one of the unit's best), and the refinement of the seeds. The
 * judge holds the verdict of the candidate being considered; a Scored (records, envelope) is
 * built only for the few candidates kept.
 *
 * The walk goes by boxes, in the grid's own order (the last axis innermost), so that every
 * candidate it judges is judged in the same order as a plain walk and the seeds, the lists and
 * their ties come out the same. A box spans a range of one axis and every value of the axes
 * inside it; when the estimator is monotone in all of them (FastEstimator.monotoneIn) and
 * screening applies, the box is bounded from its corners (CandidateJudge.boundBox) and, when
 * no member could become a seed nor rank, counted without judging any; otherwise it is halved
 * along its outer axis, down to single candidates, which are bounded one by one. Where the
 * next-to-last axis is monotone but the last is not, the walk there goes by slabs (walkSlabs):
 * the next-to-last axis's range at each value of the last, bounded from its two ends.
 */
class UnitSearch {
  private readonly ctx: CandidateContext
  private readonly judge: CandidateJudge
  /** This unit's best, in rank order. */
  readonly mine: BestList
  private readonly keep: UnitKeeper
  /** The candidates with the best objectives, best first: where refinement starts. */
  private readonly seeds: Scored[] = []
  // rank key of the candidate the judge holds: the bands, then the envelope when needed
  private m = 0
  private sr = 0
  private area = 0
  private volume = 0
  // the probe's state: whether it runs (consider() then only looks for a design that could lead) and what it found
  private probing = false
  private canLead = false
  // the box walk: per axis s, the axes a box from s spans (s, then the inner axes of more than one value), their names, whether the estimator is monotone in all of them, their full ranges, and the members per value of s
  private readonly boxAxes: number[][]
  private readonly boxNames: string[][]
  private readonly boxMonotone: boolean[]
  private readonly boxLows: Float64Array[]
  private readonly boxHighs: Float64Array[]
  private readonly innerSize: number[]
  /** Per axis: whether its walk goes by slabs (walkSlabs: monotone, next to last, the last axis not monotone and of several values). */
  private readonly slabbed: boolean[]
  /** Per value of the last axis: whether its slab was screened out. */
  private readonly slabOut: Uint8Array
  private readonly slabLow = new Float64Array(1)
  private readonly slabHigh = new Float64Array(1)
  /** The one parameter a slab spans (the next-to-last axis's). */
  private readonly slabNames: string[]
  private readonly params: Record<string, number> = {}
  private readonly cornerParams: Record<string, number> = {}
  private sinceYield = 0

  constructor(private readonly run: SearchRun, private readonly unit: Unit, private readonly axes: Axis[]) {
    this.ctx = contextOf(unit, run.window, run.compiled)
    this.judge = new CandidateJudge(this.ctx, run.keys)
    this.mine = new BestList(run.limit)
    this.keep = new UnitKeeper(unit, this.judge)
    // boxes are bounded only where the raw-number estimate is monotone and no footprint is to be checked
    const monotone = this.ctx.estimator.fill && !this.ctx.footprint ? this.ctx.estimator.monotoneIn ?? [] : []
    this.boxAxes = axes.map((_, s) => [s, ...axes.slice(s + 1).flatMap((a, i) => (a.values.length > 1 ? [s + 1 + i] : []))])
    this.boxNames = this.boxAxes.map((list) => list.map((i) => axes[i].spec.key))
    this.boxMonotone = this.boxNames.map((names) => names.every((key) => monotone.includes(key)))
    this.boxLows = this.boxAxes.map((list) => Float64Array.from(list, (i) => Math.min(...axes[i].values)))
    this.boxHighs = this.boxAxes.map((list) => Float64Array.from(list, (i) => Math.max(...axes[i].values)))
    this.innerSize = axes.map((_, s) => gridSize(axes.slice(s + 1)))
    // every key present from the start, in the grid's order (the judge sets a box's corners in params and puts its values back)
    for (const axis of axes) this.params[axis.spec.key] = axis.values[0]
    const lastAxis = axes[axes.length - 1]
    this.slabbed = axes.map((axis, s) => s === axes.length - 2 && !this.boxMonotone[s] && monotone.includes(axis.spec.key) && axis.values.length > 1 && lastAxis.values.length > 1)
    this.slabOut = new Uint8Array(lastAxis?.values.length ?? 0)
    this.slabNames = axes.length >= 2 ? [axes[axes.length - 2].spec.key] : []
  }

  /** The grid walk (see the class), yielding every YIELD_EVERY candidates. */
  *sample(): Generator<void> {
    const { axes } = this
    this.sinceYield = 0
    if (axes.length && axes.every((a) => a.values.length)) yield* this.walk()
  }

  /** Whether this unit is probed before its search: distinct answers whose leads are full, a raw-number estimator, no footprint. */
  probes(): boolean {
    const { run, ctx } = this
    return run.screen && run.distinct && run.leads.full && !!ctx.estimator.fill && !ctx.footprint
  }

  /**
   * Whether any design this unit's search would keep could enter the answer's leads
   * (run.leads, full): only then does the unit change the answer (a unit's designs are listed
   * only when its best leads one of the 2 × limit groups, which are then all first designs).
   * The grid is walked as sample() walks it, and the seeds refined as refineSeeds() refines
   * them, so the seeds and every refinement step are the search's own; but a candidate or a
   * box is passed over once it could become no seed and enter no lead, and the probe stops at
   * the first design that could lead (the unit is then searched as usual).
   */
  *probe(): Generator<void, boolean> {
    this.probing = true
    this.canLead = false
    yield* this.sample()
    if (!this.canLead) this.refineSeeds()
    this.probing = false
    return this.canLead
  }

  /**
   * The walk over the whole grid: boxes taken depth first from an explicit stack rather than by
   * a generator per box (one per value of every outer axis, which cost about a tenth of a
   * spring's search). A box is axis s over its values a..b, the axes before s holding their
   * values in params and the inner axes spanning all theirs; it is screened out, walked by
   * slabs, halved, or walked value by value, the last axis's values in a row.
   */
  private *walk(): Generator<void> {
    const { axes, params } = this
    const depth = axes.length
    // five numbers a box: its axis, its range a..b, then the next value to walk (or, halved, its middle) and the step it is at
    // (a top index rather than setting the array's length, which V8 does in a runtime call)
    const stack: number[] = [0, 0, axes[0].values.length - 1, 0, BoxStep.Enter]
    let top = 5
    const push = (s: number, a: number, b: number) => {
      stack[top] = s; stack[top + 1] = a; stack[top + 2] = b; stack[top + 3] = 0; stack[top + 4] = BoxStep.Enter
      top += 5
    }
    while (top) {
      const f = top - 5
      const s = stack[f], a = stack[f + 1], b = stack[f + 2], step = stack[f + 4]
      if (step === BoxStep.Enter) {
        if (a < b && this.boxMonotone[s] && this.boxScreenedOut(s, a, b)) { top = f; continue }
        if (this.slabbed[s] && b - a + 1 > this.cornersOf(1) && this.screening()) { top = f; yield* this.walkSlabs(s, a, b); continue }
        if (a < b && this.boxMonotone[s] && s + 1 < depth && (b - a + 1) * this.innerSize[s] > 2 * this.cornersOf(this.boxAxes[s].length)) {
          // halved while the halves are still worth bounding
          const mid = (a + b) >> 1
          stack[f + 3] = mid
          stack[f + 4] = BoxStep.SecondHalf
          push(s, a, mid)
          continue
        }
        stack[f + 3] = a
        stack[f + 4] = BoxStep.Values
        continue
      }
      if (step === BoxStep.SecondHalf) {
        const mid = stack[f + 3]
        top = f
        if (!this.canLead) push(s, mid + 1, b)
        continue
      }
      const values = axes[s].values
      const key = axes[s].spec.key
      let i = stack[f + 3]
      if (s + 1 < depth) {
        if (i > b || this.canLead) { top = f; continue }
        params[key] = values[i]
        stack[f + 3] = i + 1
        push(s + 1, 0, axes[s + 1].values.length - 1)
        continue
      }
      for (; i <= b && !this.canLead; i++) {
        params[key] = values[i]
        this.point()
        if (++this.sinceYield >= YIELD_EVERY) { this.sinceYield = 0; yield }
      }
      top = f
    }
  }

  /**
   * The walk of axis s (monotone, the next to last) over a..b where the last axis is not
   * monotone, so no box spans both: each value of the last axis first bounds its slab (axis s
   * over a..b, the last axis held at that value) from the slab's two ends, and a slab screened
   * out is counted and passed over; the rest are walked in the grid's order. A slab screened
   * out now stays out, as the seeds and lists only get harder to enter.
   */
  private *walkSlabs(s: number, a: number, b: number): Generator<void> {
    const { axes, params, slabOut } = this
    const values = axes[s].values, key = axes[s].spec.key
    const inner = axes[s + 1].values, innerKey = axes[s + 1].spec.key
    let lo = Infinity, hi = -Infinity
    for (let i = a; i <= b; i++) { if (values[i] < lo) lo = values[i]; if (values[i] > hi) hi = values[i] }
    this.slabLow[0] = lo
    this.slabHigh[0] = hi
    const names = this.slabNames
    for (let j = 0; j < inner.length; j++) {
      params[innerKey] = inner[j]
      slabOut[j] = this.screenedOut(names, this.slabLow, this.slabHigh, b - a + 1) ? 1 : 0
    }
    for (let i = a; i <= b && !this.canLead; i++) {
      params[key] = values[i]
      for (let j = 0; j < inner.length && !this.canLead; j++) {
        if (slabOut[j]) continue
        params[innerKey] = inner[j]
        this.point()
        if (++this.sinceYield >= YIELD_EVERY) { this.sinceYield = 0; yield }
      }
    }
  }

  /**
   * Whether the box (see walk) is screened out whole: it is counted and passed over when its
   * bound from the corners puts no member among the seeds nor in a list. Bounding costs 2ⁿ
   * estimates for n spanning axes (2 where the extremes lie at the ends), so only boxes of more
   * members than that are bounded.
   */
  private boxScreenedOut(s: number, a: number, b: number): boolean {
    const members = (b - a + 1) * this.innerSize[s]
    const names = this.boxNames[s]
    if (members <= this.cornersOf(names.length) || !this.screening()) return false
    const values = this.axes[s].values
    const lows = this.boxLows[s], highs = this.boxHighs[s]
    let lo = Infinity, hi = -Infinity
    for (let i = a; i <= b; i++) { if (values[i] < lo) lo = values[i]; if (values[i] > hi) hi = values[i] }
    lows[0] = lo
    highs[0] = hi
    return this.screenedOut(names, lows, highs, members)
  }

  /** Whether the box of `members` candidates (the parameters `names` spanning lows..highs, the others as in params) is screened out: then counted. */
  private screenedOut(names: readonly string[], lows: Float64Array, highs: Float64Array, members: number): boolean {
    const { judge, seeds, params } = this
    const couldBeOk = judge.boundBox(params, names, lows, highs)
    if (couldBeOk === null || judge.objective > seeds[seeds.length - 1].score.objective) return false
    if (couldBeOk && this.boxCouldRank(names, lows, highs)) return false
    this.run.tally.considered += members
    this.sinceYield += members
    return true
  }

  /**
   * One candidate of the walk. Once screening applies, a candidate whose nominal estimate
   * bounds it out of the seeds and of a full list (or, probing, of the leads) cannot change
   * the answer (its band only ranks it lower; the reasons and nearest miss only explain an
   * empty answer): it is counted, not banded.
   */
  private point(): void {
    this.judgeStep(this.params, Infinity)
  }

  /**
   * A candidate judged and considered, or (screening) counted without its band when its bound
   * could make it no seed, enter no list (probing: no lead) and, for a refinement trial, not
   * beat `floor`, the climb's best so far (see refine; +∞ for a grid point).
   */
  private readonly judgeStep = (params: Record<string, number>, floor: number): void => {
    const { judge, seeds } = this
    if (this.screening()) {
      const couldBeOk = judge.bound(params)
      if (judge.objective <= floor && judge.objective <= seeds[seeds.length - 1].score.objective &&
        (!couldBeOk || !(this.probing ? this.couldLead(params) : this.couldRank(params)))) {
        this.run.tally.considered++
        return
      }
      judge.judgeBounded(params)
    } else judge.judge(params)
    this.consider(params)
  }

  /** Estimates a bound of a box spanning n axes costs (CandidateJudge.boxCorners). */
  private cornersOf(n: number): number {
    const { last, step } = boxCorners(this.ctx.estimator, n)
    return Math.floor(last / step) + 1
  }

  /** Whether candidates may be screened by bounds: the seeds are full, and (probing) the leads or this unit's list or the answer so far is. */
  private screening(): boolean {
    const { seeds, mine, run } = this
    return run.screen && seeds.length >= REFINE_SEEDS && (this.probing || mine.full || (!run.distinct && run.best.full))
  }

  /** Whether the verdict (or bound) the judge holds for params could enter the full leads. */
  private couldLead(params: Record<string, number>): boolean {
    const leads = this.run.leads
    this.bands()
    if (leads.outOnBands(this.m, this.sr)) return false
    this.envelope(params)
    return leads.place(this.m, this.sr, this.area, this.volume, this.judge.windowMargin) < leads.n
  }

  /**
   * couldRank (probing: couldLead) for the box bound the judge holds: its bands, and the
   * smallest envelope over the box's corners (the envelope's area and volume are monotone in
   * the estimator's monotone parameters, a test holds every family to it).
   */
  private boxCouldRank(keys: readonly string[], lows: Float64Array, highs: Float64Array): boolean {
    const { run, mine, params } = this
    const lists = this.probing ? [run.leads] : !run.distinct ? [mine, run.best] : [mine]
    this.bands()
    // out of any one list is out of the answer (see couldRank)
    if (lists.some((l) => l.outOnBands(this.m, this.sr))) return false
    const corner = this.cornerParams
    for (const key in params) corner[key] = params[key]
    let area = Infinity, volume = Infinity
    const { last, step } = boxCorners(this.ctx.estimator, keys.length)
    for (let c = 0; c <= last; c += step) {
      for (let i = 0; i < keys.length; i++) corner[keys[i]] = c & (1 << i) ? highs[i] : lows[i]
      const env = this.unit.family.envelope(corner)
      if (env.x * env.y < area) area = env.x * env.y
      if (env.x * env.y * env.z < volume) volume = env.x * env.y * env.z
    }
    // a list that is not full takes anything
    return lists.every((l) => !l.full || l.place(this.m, this.sr, area, volume, this.judge.windowMargin) < l.n)
  }

  /** Refines around each seed and offers what each refinement ends on (probing, until a design could lead). */
  refineSeeds(): void {
    if (this.run.options.refine === false) return
    const continuous = this.axes.filter((a) => a.kind === 'continuous' || a.kind === 'height')
    if (!continuous.length) return
    for (const seed of this.seeds) {
      if (this.canLead) break
      if (seed.score.objective === -Infinity) continue
      const found = refine(this.judge, continuous, seed.params, seed.score, this.judgeStep)
      if (found.ok) {
        this.judge.judge(found.params)
        this.keep.reset()
        this.offer(found.params)
      }
    }
  }

  /** Tallies the candidate the judge has just judged, and keeps it where it counts. */
  readonly consider = (params: Record<string, number>): void => {
    const { judge, keep, seeds, run } = this
    const tally = run.tally
    tally.considered++
    keep.reset()
    if (judge.ok) this.offer(params)
    else if (!this.probing) {
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

  /** Enters an accepted candidate into this unit's list where it ranks. */
  private offer(params: Record<string, number>): void {
    // probing, an accepted candidate only says whether the unit could lead
    if (this.probing) {
      if (!this.canLead && this.couldLead(params)) this.canLead = true
      return
    }
    const { mine, judge } = this
    this.bands()
    if (mine.outOnBands(this.m, this.sr)) return
    this.envelope(params)
    const at = mine.place(this.m, this.sr, this.area, this.volume, judge.windowMargin)
    if (at >= mine.n || mine.holds(at, params, this.m, this.sr, this.area, this.volume, judge.windowMargin)) return
    mine.insert(at, this.keep.scored(params), this.m, this.sr, this.area, this.volume)
  }

  /** Whether the candidate (bounded by the judge) could still enter this unit's list and the answer so far. */
  private couldRank(params: Record<string, number>): boolean {
    const { mine, judge, run } = this
    const best = run.best
    this.bands()
    if (mine.outOnBands(this.m, this.sr) || (!run.distinct && best.outOnBands(this.m, this.sr))) return false
    this.envelope(params)
    return !(mine.full && mine.place(this.m, this.sr, this.area, this.volume, judge.windowMargin) >= mine.n) &&
      !(!run.distinct && best.full && best.place(this.m, this.sr, this.area, this.volume, judge.windowMargin) >= best.n)
  }

  private bands(): void {
    this.m = marginRank(this.judge.windowMargin)
    this.sr = safetyRank(this.judge.strainMargin === null ? null : this.judge.strainMargin + 1)
  }

  private envelope(params: Record<string, number>): void {
    if (this.ctx.footprint) {
      this.area = this.judge.envelopeX * this.judge.envelopeY
      this.volume = this.area * this.judge.envelopeZ
    } else {
      const env = this.unit.family.envelope(params)
      this.area = env.x * env.y
      this.volume = env.x * env.y * env.z
    }
  }
}

type Group = DistinctGroup<Scored>

/** Step 3: the one ranking of every unit's best, folded into distinct answers (spares beyond the limit stand in for results the exact check drops). */
function rankAnswers(run: SearchRun): Group[] {
  const { accepted, limit } = run
  return run.distinct
    ? distinctAnswers(bestOf(accepted, accepted.length), 2 * limit, (s) => ({ group: `${s.unit.entry.id}|${s.unit.material.id}`, family: s.unit.family, params: s.params }))
    : bestOf(accepted, 2 * limit).map((lead) => ({ lead, tier: 1 as const, variants: [] as Scored[] }))
}

/** Step 4: the leading answers confirmed with the exact method (and uncertain estimates judged exactly), in rank order. */
function* confirmAnswers(run: SearchRun, groups: Group[]): Generator<void, { results: SearchResult[]; dropped: DroppedResult[] }> {
  const { window, compiled, limit, materials, distinct } = run
  const confirmCount = run.options.confirm ?? DEFAULT_CONFIRM
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
      run.progress(run.units.length, 'confirming')
      const check = exactCheck(window, compiled, s.unit.family, s.unit.material, s.params, s.score.nominal ?? {}, tolerance, materials, uncertain,
        decisive || !s.score.low || !s.score.high ? null : { low: s.score.low, high: s.score.high }, wideBeamOf(s.unit))
      yield
      if (check.contradiction) {
        dropped.push({ entryId: s.unit.entry.id, entryName: s.unit.entry.name, params: { ...s.params, material: s.unit.material.id }, reason: check.contradiction, uncertain })
        continue
      }
      confirmed = check.confirmation
    }
    results.push(resultOf(run, s, group, results.length + 1, uncertain, confirmed, distinct))
  }
  return { results, dropped }
}

function resultOf(run: SearchRun, s: Scored, group: Group, position: number, uncertain: string[], confirmed: Confirmation | null, distinct: boolean): SearchResult {
  const band = bandOf(run.compiled, s.score)
  const env = s.unit.family.envelope(s.params)
  return {
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
    why: describeResult(position, run.window, band, s.score, env, s.unit.material, confirmed),
    ...(distinct ? { rank: rankKeyOf(s, group.tier), closeVariants: group.variants.map(variantOf) } : {}),
  }
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

/** Step 5: the answer and its explanation. */
function answerOf(run: SearchRun, groups: Group[], results: SearchResult[], dropped: DroppedResult[]): SearchAnswer {
  const { window, compiled, tally, distinct } = run
  run.progress(run.units.length, 'done')
  const elapsedMs = now() - run.started
  const tol = resolveTolerance(window.tolerance)
  const entries = new Set(results.map((r) => r.entryId)).size
  const explanation = results.length
    ? `${results.length} configuration${results.length === 1 ? '' : 's'} from ${entries} entr${entries === 1 ? 'y' : 'ies'} keep the whole tolerance band (walls ±${tol.thickness} mm, modulus ±${Math.round(tol.modulus * 100)} %) inside the window and the strain under the material's limit; ${tally.considered} candidates estimated. Ranked by margin to the window's edges over the band, then strain safety, footprint and envelope volume (a print-time proxy).${distinct ? ` The best design of each entry and material is listed first, then further designs that differ by more than a step and 3 % in some parameter; ${foldedText(groups)}` : ''}${tally.unprintable.length ? ` Not printable on this printer: ${tally.unprintable.join('; ')}.` : ''} Predicted forces are estimates to be confirmed on printed parts.`
    : explainEmpty(window, compiled, tally, run.rules)
  return { results, considered: tally.considered, elapsedMs, explanation: explanation + droppedSentence(dropped), dropped }
}

/** The search, step by step; a generator so one body serves the synchronous and the time-sliced run. */
function* searchBody(window: ForceWindow, shelf: Shelf, options: SearchOptions & { index?: ShelfTextIndex }): Generator<void, SearchAnswer> {
  const run = startRun(window, shelf, options)
  yield* searchUnits(run)
  const groups = rankAnswers(run)
  const { results, dropped } = yield* confirmAnswers(run, groups)
  return answerOf(run, groups, results, dropped)
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

/** The explanation's sentence on results the exact check dropped (empty when none was). */
function droppedSentence(dropped: DroppedResult[]): string {
  if (!dropped.length) return ''
  const named = dropped.slice(0, 3).map((d) => `${d.entryName}: ${d.reason}${d.uncertain.length ? ` (the estimate was marked uncertain: ${d.uncertain.join(', ')})` : ''}`)
  return ` ${dropped.length} configuration${dropped.length === 1 ? ' was' : 's were'} dropped because the exact method contradicts the fast estimate — ${named.join('; ')}${dropped.length > 3 ? `; and ${dropped.length - 3} more` : ''}.`
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
const TIME_SLICE_MS = 15

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
