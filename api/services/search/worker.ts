/**
 * One search thread: runs the catalog's time-sliced search for each task it is sent, so a
 * cancel message is read between slices, and posts throttled progress back.
 */
import { parentPort } from 'node:worker_threads'
import { families, searchShelf, ValidationError, type SearchProgress } from '../../../catalog'
import { ShelfTextIndex } from '../../../catalog/search'
import type { FromWorker, SearchTask, ToWorker } from './protocol'

/** Least time between two progress messages of one task, ms (phase changes always go). */
const PROGRESS_EVERY_MS = 40

const port = parentPort
if (!port) throw new Error('the search worker must run in a worker thread')
const post = (message: FromWorker) => port.postMessage(message)
const running = new Map<number, AbortController>()
let index: { version: string; index: ShelfTextIndex } | null = null

function textIndex(task: SearchTask): ShelfTextIndex {
  if (!index) index = { version: task.shelfVersion, index: new ShelfTextIndex(task.shelf, families) }
  else if (index.version !== task.shelfVersion) {
    index.index.rebuild(task.shelf)
    index.version = task.shelfVersion
  }
  return index.index
}

async function run(id: number, task: SearchTask) {
  const controller = new AbortController()
  running.set(id, controller)
  let last = 0
  let lastPhase = ''
  const onProgress = (progress: SearchProgress) => {
    const now = performance.now()
    if (progress.phase === lastPhase && now - last < PROGRESS_EVERY_MS) return
    last = now
    lastPhase = progress.phase
    post({ type: 'progress', id, progress })
  }
  try {
    const answer = await searchShelf(task.window, task.shelf, { materials: task.materials, index: textIndex(task), onProgress, signal: controller.signal })
    post({ type: 'result', id, answer })
  } catch (e) {
    const err = e as Error
    if (err.name === 'AbortError') post({ type: 'cancelled', id })
    else post({ type: 'failed', id, name: err.name, message: err.message, issues: err instanceof ValidationError ? err.issues : undefined })
  } finally {
    running.delete(id)
  }
}

port.on('message', (message: ToWorker) => {
  if (message.type === 'run') void run(message.id, message.task)
  else running.get(message.id)?.abort()
})
post({ type: 'ready' })
