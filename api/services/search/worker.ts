/**
 * A search thread: piscina calls the default export once per search. It runs the catalog's
 * time-sliced search, so a cancel on the task's port is read between slices, and posts
 * throttled progress back on that port.
 */
import { threadId } from 'node:worker_threads'
import { families, searchShelf, ValidationError, type SearchProgress } from '../../../catalog'
import { ShelfTextIndex } from '../../../catalog/search'
import type { PortMessage, SearchTask, ThreadOutcome, ThreadTask } from './protocol'

/** Least time between two progress messages of one task, ms (phase changes always go). */
const PROGRESS_EVERY_MS = 40

let index: { version: string; index: ShelfTextIndex } | null = null

function textIndex(task: SearchTask): ShelfTextIndex {
  if (!index) index = { version: task.shelfVersion, index: new ShelfTextIndex(task.shelf, families) }
  else if (index.version !== task.shelfVersion) {
    index.index.rebuild(task.shelf)
    index.version = task.shelfVersion
  }
  return index.index
}

export default async function search({ task, port }: ThreadTask): Promise<ThreadOutcome> {
  const controller = new AbortController()
  port.postMessage({ type: 'started', threadId } satisfies PortMessage)
  port.on('message', (m: PortMessage) => { if (m.type === 'cancel') controller.abort() })
  let last = 0
  let lastPhase = ''
  const onProgress = (progress: SearchProgress) => {
    const now = performance.now()
    if (progress.phase === lastPhase && now - last < PROGRESS_EVERY_MS) return
    last = now
    lastPhase = progress.phase
    port.postMessage({ type: 'progress', progress } satisfies PortMessage)
  }
  try {
    const answer = await searchShelf(task.window, task.shelf, { materials: task.materials, index: textIndex(task), onProgress, signal: controller.signal })
    return { type: 'result', answer }
  } catch (e) {
    const err = e as Error
    if (err.name === 'AbortError') return { type: 'cancelled' }
    return { type: 'failed', name: err.name, message: err.message, issues: err instanceof ValidationError ? err.issues : undefined }
  } finally {
    port.close()
  }
}
