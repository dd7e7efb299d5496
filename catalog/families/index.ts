import type { FamilyDefinition } from '../schema/types'

// Each family lives in its own folder with params.ts, model.ts, geometry.ts and index.ts;
// this list is the shelf's order.
export const families: readonly FamilyDefinition[] = Object.freeze([])
