/**
 * The built-in demo shelf for the CLI: the released demo entries, copied as data from the
 * API's seed definitions (api/db/demo-shelf.ts; catalog/ may not import api/). A test keeps
 * the copy in step with the seed.
 */
import demo from './demo-shelf.json'
import type { Shelf, ShelfEntry } from './types'

export const DEMO_SHELF: Shelf = Object.freeze((demo as unknown as ShelfEntry[]).map((e) => Object.freeze(e)))
