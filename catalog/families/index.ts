import type { FamilyDefinition } from '../schema/types'
import { bistableBeam } from './bistable-beam'
import { leafHinge } from './leaf-hinge'
import { notchHinge } from './notch-hinge'
import { parallelGuide } from './parallel-guide'
import { serpentineSpring } from './serpentine-spring'
import { snapHook } from './snap-hook'

// Each family lives in its own folder with params.ts, model.ts, geometry.ts and index.ts (made
// with defineFamily); this list is the shelf's order. The registry (../registry.ts) starts from it.
export const builtinFamilies: readonly FamilyDefinition[] = Object.freeze([bistableBeam, leafHinge, notchHinge, parallelGuide, serpentineSpring, snapHook])
