/**
 * The shelf search's inputs and outputs. A shelf is the list of entries the librarians curate
 * (the API reads it from the database; the CLI from a JSON file or the built-in demo shelf).
 */
import type { ParamRanges } from '../schema/validate'
import type { FamilyDefinition, MetricValue } from '../schema/types'

type EntryStatus = 'draft' | 'in_review' | 'released' | 'retired'

export interface ShelfEntry {
  id: string | number
  familyId: string
  name: string
  summary: string
  tags: string[]
  /** Material ids the entry may be printed in. */
  materials: string[]
  /** The entry's default configuration (numbers, plus an optional `material`). */
  defaultParams: Record<string, number | string>
  /** Allowed ranges; a parameter without one stays at its default. */
  ranges: ParamRanges
  /** Only released entries are searched. */
  status: EntryStatus
}

export type Shelf = readonly ShelfEntry[]

/** A material as search needs it (the API resolves its curated list to these numbers). */
export interface SearchMaterial {
  id: string
  name: string
  modulus: number
  strainLimit: number
  /** Poisson's ratio; when left out, the built-in material's of the same id (poissonRatioOf). */
  poissonRatio?: number
}

export interface SearchProgress {
  /** Entry–material pairs searched so far, and in all. */
  done: number
  total: number
  /** Candidate parameter sets estimated so far. */
  considered: number
  phase: 'sampling' | 'refining' | 'confirming' | 'done'
}

export interface SearchOptions {
  /** Families to search (defaults to the catalog's registry). */
  families?: readonly FamilyDefinition[]
  /** Materials the shelf may name (defaults to the built-in ones). */
  materials?: readonly SearchMaterial[]
  /** Results confirmed with the exact method (the rest carry `confirmed: null`). */
  confirm?: number
  /** Candidate parameter sets sampled per entry and material before refinement. */
  budget?: number
  /** Refine around the best candidates with a local search (default true). */
  refine?: boolean
  /**
   * Screen candidates by cheap bounds (default true): a candidate, a box of them or a whole
   * entry in a material that provably cannot change the answer is counted without being
   * judged in full. False judges every candidate; the answer is the same (a test holds it to
   * that), only slower.
   */
  screen?: boolean
  /**
   * Fold close variants under the best of them and list the best design of each entry and
   * material first (distinct.ts; default true). False gives the plain ranking of every
   * parameter set, as the engine's regression fixture records it.
   */
  distinct?: boolean
  onProgress?: (progress: SearchProgress) => void
  signal?: AbortSignal
}

export interface Confirmation {
  method: string
  /** Window metrics from the exact method at the result's parameters; null when it failed. */
  metrics: Record<string, MetricValue> | null
  /** Relative difference, exact against fast estimate, per window metric. */
  agreement: Record<string, number>
  /** Where the fast estimate states its error (the bistable table): the allowed difference per window metric, in its units. */
  tolerance?: Record<string, number>
  /** Whether every stated allowance holds; absent when the estimate states none. */
  withinTolerance?: boolean
  /** The exact method's nominal verdict against the window (absent when it failed). */
  verdict?: 'inside' | 'edge' | 'outside'
  /** The exact method's band over the tolerance corners, per window metric ([low, high], null when empty). */
  band?: Record<string, [number, number] | null>
  /** Smallest window margin of that band (the same rule as the fast band's margin). */
  margin?: number
  /** Why the fast estimate was uncertain of itself, when it was (the result was then judged exactly whatever its rank). */
  uncertain?: string[]
  error?: string
}

/**
 * Where a result stands, in the order the ranking applies: tier (the best design of its entry
 * and material before further distinct designs), the margin's band (5 % of the window, larger
 * first), the strain safety's band (0.1, larger first; null counts as ample), then the
 * smaller footprint and envelope volume.
 */
export interface RankKey {
  tier: 1 | 2
  /** Lower and upper edge of the margin band, fractions of the window. */
  marginBand: [number, number]
  /** Lower and upper edge of the strain-safety band; null: ample (at or above the cap) or no strain. */
  safetyBand: [number, number] | null
  /** Envelope area in the build plane, mm². */
  footprint: number
  /** Envelope volume, mm³. */
  volume: number
}

/** A configuration folded under a listed one (within a step or 3 % on every parameter). */
export interface CloseVariant {
  params: Record<string, number | string>
  margin: number
  safetyFactor: number | null
}

export interface SearchResult {
  entryId: string | number
  entryName: string
  family: string
  params: Record<string, number | string>
  metrics: Record<string, MetricValue>
  band: Record<string, [number, number] | null>
  /** Smallest margin over the tolerance band to the window's edges (fractions of the window). */
  margin: number
  /** Strain safety factor at the band's worst corner. */
  safetyFactor: number | null
  /** Method of the fast estimate. */
  method: string
  /** Why the fast estimate is uncertain of itself (empty when it is not); see Confirmation.uncertain. */
  uncertain: string[]
  confirmed: Confirmation | null
  why: string
  /** The sort key, as applied (absent in the plain ranking, `distinct: false`). */
  rank?: RankKey
  /** Close variants folded under this result, best first. */
  closeVariants?: CloseVariant[]
}

/** A result the exact check contradicted: left out of the answer, and said so in its explanation. */
export interface DroppedResult {
  entryId: string | number
  entryName: string
  params: Record<string, number | string>
  reason: string
  uncertain: string[]
}

export interface SearchAnswer {
  results: SearchResult[]
  /** Candidate parameter sets estimated (sampling and refinement). */
  considered: number
  elapsedMs: number
  explanation: string
  /** Results the exact check contradicted (the fast estimate's band held, the exact one did not). */
  dropped: DroppedResult[]
}
