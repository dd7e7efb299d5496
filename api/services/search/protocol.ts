/** Messages between the search service and its worker threads (structured-clone plain data). */
import type { FieldIssue, ForceWindow, SearchAnswer, SearchMaterial, SearchProgress, ShelfEntry } from '../../../catalog'

export interface SearchTask {
  window: ForceWindow
  shelf: ShelfEntry[]
  materials: SearchMaterial[]
  /** Shelf fingerprint: the worker keeps its text index while it stays the same. */
  shelfVersion: string
}

export type ToWorker =
  | { type: 'run'; id: number; task: SearchTask }
  | { type: 'cancel'; id: number }

export type FromWorker =
  | { type: 'ready' }
  | { type: 'progress'; id: number; progress: SearchProgress }
  | { type: 'result'; id: number; answer: SearchAnswer }
  | { type: 'cancelled'; id: number }
  | { type: 'failed'; id: number; name: string; message: string; issues?: FieldIssue[] }
