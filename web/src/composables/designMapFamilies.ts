/**
 * The families as the design map needs them — parameters, cross rules, metrics and methods —
 * imported from each family folder's params and model modules rather than from the registry,
 * so that the map's web worker does not bundle what only the registry's other parts need (the
 * JSCAD geometry behind build(), the exact solvers behind evaluate()). A test holds this list
 * to the registry.
 */
import type { FamilyDefinition } from '@catalog/schema/types'
import { params as bistableParams, rules as bistableRules } from '@catalog/families/bistable-beam/params'
import { methods as bistableMethods, metrics as bistableMetrics } from '@catalog/families/bistable-beam/model'
import { params as leafParams, rules as leafRules } from '@catalog/families/leaf-hinge/params'
import { methods as leafMethods, metrics as leafMetrics } from '@catalog/families/leaf-hinge/model'
import { params as notchParams, rules as notchRules } from '@catalog/families/notch-hinge/params'
import { methods as notchMethods, metrics as notchMetrics } from '@catalog/families/notch-hinge/model'
import { params as guideParams, rules as guideRules } from '@catalog/families/parallel-guide/params'
import { methods as guideMethods, metrics as guideMetrics } from '@catalog/families/parallel-guide/model'
import { params as springParams, rules as springRules } from '@catalog/families/serpentine-spring/params'
import { methods as springMethods, metrics as springMetrics } from '@catalog/families/serpentine-spring/model'
import { params as hookParams, rules as hookRules } from '@catalog/families/snap-hook/params'
import { methods as hookMethods, metrics as hookMetrics } from '@catalog/families/snap-hook/model'

/** What the map reads of a family. */
export type MapFamily = Pick<FamilyDefinition, 'id' | 'params' | 'rules' | 'methods' | 'metrics'>

export const mapFamilies: readonly MapFamily[] = Object.freeze([
  { id: 'bistable-beam', params: bistableParams, rules: bistableRules, methods: bistableMethods, metrics: bistableMetrics },
  { id: 'leaf-hinge', params: leafParams, rules: leafRules, methods: leafMethods, metrics: leafMetrics },
  { id: 'notch-hinge', params: notchParams, rules: notchRules, methods: notchMethods, metrics: notchMetrics },
  { id: 'parallel-guide', params: guideParams, rules: guideRules, methods: guideMethods, metrics: guideMetrics },
  { id: 'serpentine-spring', params: springParams, rules: springRules, methods: springMethods, metrics: springMetrics },
  { id: 'snap-hook', params: hookParams, rules: hookRules, methods: hookMethods, metrics: hookMetrics },
])
