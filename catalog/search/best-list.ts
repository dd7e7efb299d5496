/**
 * The engine's kept candidates and the running lists of the best of them. Every list here
 * orders by the one ranking of rank.ts (compareRankParts / compareRankKeys): the per-unit
 * lists that screen candidates during sampling and the final ordering of all units' bests.
 */
import type { FamilyDefinition } from '../schema/types'
import type { CandidateJudge, CandidateScore } from './candidate'
import { compareRankKeys, compareRankParts, rankKey } from './rank'
import type { SearchMaterial, ShelfEntry } from './types'

/** One entry in one of its materials: what the search samples in one go. */
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

function scoredOf(unit: Unit, params: Record<string, number>, score: CandidateScore): Scored {
  const env = unit.family.envelope(params)
  return { unit, params: { ...params }, score, area: env.x * env.y, volume: env.x * env.y * env.z }
}

export const rankOf = (s: Scored) => ({ windowMargin: s.score.windowMargin, safetyFactor: s.score.strainMargin === null ? null : s.score.strainMargin + 1, area: s.area, volume: s.volume })

/**
 * The n best by rank, each parameter set once, kept as candidates are offered: the same as
 * bestOf over every candidate in the order offered (the sort is stable, so of equal keys the
 * earlier stays ahead, and a repeated parameter set has an equal key), without holding them
 * all. Keys are rankKey's four numbers, then the window margin.
 */
export class BestList {
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
      if (!(compareRankParts(keys[o], keys[o + 1], keys[o + 2], keys[o + 3], items[at - 1].score.windowMargin, m, s, area, volume, windowMargin) > 0)) break
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

  /** Merges another list's first `count` items after this one's (a later unit's): bestOf over the concatenation. */
  merge(other: BestList, count = other.items.length): void {
    for (let i = 0; i < Math.min(count, other.items.length); i++) {
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

/** The n best by rank, each parameter set once (the final ordering of every unit's best). */
export function bestOf(list: Scored[], n: number): Scored[] {
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

/**
 * Builds the Scored of the candidate being considered at most once, from the judge's raw
 * numbers; no closure per candidate.
 */
export class UnitKeeper {
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
    this.kept = scoredOf(this.unit, params, this.judge.scoreJudged())
    return this.kept
  }
}
