/** What the search pool and its threads exchange (structured-clone plain data). */
import type { MessagePort } from 'node:worker_threads'
import type { FieldIssue, ForceWindow, SearchAnswer, SearchMaterial, SearchProgress, ShelfEntry } from '../../../catalog'

export interface SearchTask {
  window: ForceWindow
  shelf: ShelfEntry[]
  materials: SearchMaterial[]
  /** Shelf fingerprint: the thread keeps its text index while it stays the same. */
  shelfVersion: string
}

/** One piscina task: the search, and the port its progress and cancel travel on. */
export interface ThreadTask {
  task: SearchTask
  port: MessagePort
}

/** On the task's port: which thread picked the search up and its progress, from the thread; a cancel, to it. */
export type PortMessage =
  | { type: 'started'; threadId: number }
  | { type: 'progress'; progress: SearchProgress }
  | { type: 'cancel' }

/** How a task ends (an outcome rather than a thrown error, whose name and issues a thread boundary would lose). */
export type ThreadOutcome =
  | { type: 'result'; answer: SearchAnswer }
  | { type: 'cancelled' }
  | { type: 'failed'; name: string; message: string; issues?: FieldIssue[] }
