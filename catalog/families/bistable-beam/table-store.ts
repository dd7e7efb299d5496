/**
 * The bistable performance table as data: table-data.json (written by npm run tables) and a
 * small typed loader. The file is read on first use, not when a module imports this one, so
 * the family's model, the registry and every screen that does not estimate bistable parts
 * never pay for it; the browser fetches it as its own chunk.
 *
 * Lookup layout (what the interpolation reads): the grid axes as Float64Arrays, ln η beside η,
 * and the values node-major — all metrics of a node together, node index (iq·|η| + ie)·|w| + iw,
 * value of metric m at values[node·metrics.length + m]; NaN where a node was not solved (outside
 * the valid groups) or the solver lost the path.
 */
import { TABLE_METRICS, type BistableTableFile, type TableMetric, type TableValidation } from './table-build'

export interface BistableTable {
  solverVersion: number
  modelVersion: number
  /** Metric of each slot of a node (TABLE_METRICS). */
  metrics: readonly TableMetric[]
  q: Float64Array
  eta: Float64Array
  logEta: Float64Array
  /** w = (postLength/span)·(span/thickness)^(2/3). */
  w: Float64Array
  /** Node-major values (see above). */
  values: Float64Array
  validation: TableValidation
}

export const TABLE_FILE_FORMAT = 'flexshelf-bistable-table'
export const TABLE_FILE_VERSION = 1

/** Turns the file's per-metric lists (null for not computed) into the lookup layout; checks its shape. */
export function decodeTable(file: BistableTableFile): BistableTable {
  if (file.format !== TABLE_FILE_FORMAT || file.formatVersion !== TABLE_FILE_VERSION) {
    throw new Error(`bistable table: expected ${TABLE_FILE_FORMAT} version ${TABLE_FILE_VERSION}, found ${String(file.format)} version ${String(file.formatVersion)}`)
  }
  const q = Float64Array.from(file.axes.q), eta = Float64Array.from(file.axes.eta), w = Float64Array.from(file.axes.w)
  const nodes = q.length * eta.length * w.length
  const count = TABLE_METRICS.length
  const values = new Float64Array(nodes * count)
  for (let m = 0; m < count; m++) {
    const column = file.values[TABLE_METRICS[m]]
    if (!Array.isArray(column) || column.length !== nodes) throw new Error(`bistable table: ${TABLE_METRICS[m]} has ${column?.length ?? 0} values, the grid has ${nodes} nodes`)
    for (let i = 0; i < nodes; i++) {
      const v = column[i]
      values[i * count + m] = typeof v === 'number' ? v : NaN
    }
  }
  return {
    solverVersion: file.solverVersion, modelVersion: file.modelVersion, metrics: TABLE_METRICS,
    q, eta, logEta: eta.map(Math.log), w, values, validation: file.validation,
  }
}

let loaded: BistableTable | null = null

/** Loads the table (once); in the browser this fetches its chunk. */
export async function loadBistableTable(): Promise<BistableTable> {
  if (!loaded) {
    const file = (await import('./table-data.json')).default as unknown as BistableTableFile
    loaded ??= decodeTable(file)
  }
  return loaded
}

/**
 * The table, synchronously. Under Node it is read on the first call (a JSON module next to
 * this one, through Node's own module loader: no network, no writes); a browser must have
 * awaited loadBistableTable() first, and gets an error naming that otherwise.
 */
export function bistableTable(): BistableTable {
  if (loaded) return loaded
  const nodeModule = (globalThis as { process?: { getBuiltinModule?: (id: string) => unknown } }).process?.getBuiltinModule?.('node:module') as
    | { createRequire(url: string): (id: string) => unknown }
    | undefined
  if (!nodeModule) throw new Error('the bistable performance table is not loaded yet: await loadBistableTable() before estimating bistable parts')
  loaded = decodeTable(nodeModule.createRequire(import.meta.url)('./table-data.json') as BistableTableFile)
  return loaded
}
