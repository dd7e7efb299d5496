/**
 * defineFamily: ties a family folder's modules into its FamilyDefinition and checks, once, when
 * the folder is loaded, that the parts agree with each other (a default method the family offers,
 * rules over its own parameters, an estimator for one of its methods, a design map over two of
 * its parameters). A mistake in a new family then fails at start-up with a message naming it,
 * rather than as a wrong answer deep in search. See DEVELOPERS.md, "Adding a module family".
 */
import type {
  AxisSpec, CrossRule, FamilyDefinition, FamilyDesignMap, FamilySearch, FamilyTolerance, MethodInfo, MetricSpec,
  ModelInput, ModelOutput, ParamSpec,
} from './types'

/** What a family's index.ts states itself; the rest comes from its params, model and geometry modules. */
export interface FamilyIdentity {
  id: string
  name: string
  kind: FamilyDefinition['kind']
  summary: string
  /** Cautions shown with every result (strain, creep, fatigue, confirm on printed parts). */
  cautions: string[]
  /** The method a configuration uses when none is asked for; the first method when left out. */
  defaultMethod?: string
  /** The family bends beams: it takes `wideBeam` and its model states the rule it applied. */
  bendsBeams?: boolean
  search?: FamilySearch
  designMap?: FamilyDesignMap
  tolerance?: FamilyTolerance
}

/** The family folder's modules, as `import * as params from './params'` and so on. */
export interface FamilyParts {
  params: { params: ParamSpec[]; rules: CrossRule[] }
  model: {
    methods: MethodInfo[]
    metrics: MetricSpec[]
    axes: { displacement: AxisSpec; force: AxisSpec }
    evaluate: (input: ModelInput) => ModelOutput
  }
  geometry: {
    build: (params: Record<string, number>) => unknown
    envelope: (params: Record<string, number>) => { x: number; y: number; z: number }
  }
}

const FAMILY_ID = /^[a-z][a-z0-9]*(-[a-z0-9]+)*$/

function duplicates(keys: readonly string[]): string[] {
  return keys.filter((k, i) => keys.indexOf(k) !== i)
}

/** Every way the parts can disagree, each as a sentence naming the field. */
function problemsOf(f: FamilyDefinition): string[] {
  const problems: string[] = []
  if (!FAMILY_ID.test(f.id)) problems.push(`id "${f.id}" must be lower-case words joined by hyphens`)
  const paramKeys = f.params.map((p) => p.key)
  for (const k of duplicates(paramKeys)) problems.push(`parameter "${k}" is declared twice`)
  for (const p of f.params) {
    if (!(p.min <= p.default && p.default <= p.max)) problems.push(`parameter "${p.key}": default ${p.default} is outside [${p.min}, ${p.max}]`)
    if (!(p.step > 0)) problems.push(`parameter "${p.key}": step must be positive`)
  }
  for (const rule of f.rules) {
    for (const field of rule.fields) if (!paramKeys.includes(field)) problems.push(`a rule names "${field}", which is not a parameter`)
  }
  const methodIds = f.methods.map((m) => m.id)
  if (methodIds.length === 0) problems.push('methods: a family needs at least one published method')
  for (const k of duplicates(methodIds)) problems.push(`method "${k}" is declared twice`)
  for (const m of f.methods) if (!m.source.trim()) problems.push(`method "${m.id}" names no source`)
  if (!methodIds.includes(f.defaultMethod)) problems.push(`defaultMethod "${f.defaultMethod}" is not one of its methods (${methodIds.join(', ')})`)
  const metricKeys = f.metrics.map((m) => m.key)
  for (const k of duplicates(metricKeys)) problems.push(`metric "${k}" is declared twice`)
  if (f.cautions.length === 0) problems.push('cautions: every family states its cautions (strain, creep, confirm on printed parts)')
  const estimator = f.search?.estimator
  if (estimator) {
    if (!methodIds.includes(estimator.reproduces)) problems.push(`search: the estimator reproduces "${estimator.reproduces}", which is not one of its methods`)
    for (const k of estimator.layout?.keys ?? []) if (!metricKeys.includes(k)) problems.push(`search: the estimator's layout names "${k}", which is not a metric`)
  }
  if (f.designMap) {
    const [x, y] = f.designMap.sweep
    if (x === y) problems.push('designMap: sweep needs two different parameters')
    for (const k of [x, y]) {
      const p = f.params.find((q) => q.key === k)
      if (!p) problems.push(`designMap: sweep names "${k}", which is not a parameter`)
      else if (p.integer) problems.push(`designMap: "${k}" is a whole-number parameter and cannot be swept`)
    }
  }
  return problems
}

/** The family's definition from its folder's modules; throws when the parts disagree. */
export function defineFamily(identity: FamilyIdentity, parts: FamilyParts): FamilyDefinition {
  const { search, designMap, tolerance, ...rest } = identity
  const family: FamilyDefinition = {
    ...rest,
    params: parts.params.params,
    rules: parts.params.rules,
    methods: parts.model.methods,
    defaultMethod: identity.defaultMethod ?? parts.model.methods[0]?.id,
    metrics: parts.model.metrics,
    axes: parts.model.axes,
    evaluate: parts.model.evaluate,
    build: parts.geometry.build,
    envelope: parts.geometry.envelope,
    ...(search ? { search } : {}),
    ...(designMap ? { designMap } : {}),
    ...(tolerance ? { tolerance } : {}),
  }
  const problems = problemsOf(family)
  if (problems.length) throw new Error(`module family "${identity.id}" is not well defined: ${problems.join('; ')}`)
  return family
}

/** The corotational beam solver every family but the snap hook offers; `source` says what is meshed and how it is loaded. */
export function nonlinearFeMethod(source: string): MethodInfo {
  return { id: 'nonlinear-fe', label: 'Nonlinear beam finite elements', source }
}

/** The largest strain in the part at the end of its working range. */
export function peakStrainMetric(help: string, label = 'Peak strain'): MetricSpec {
  return { key: 'maxStrain', label, unit: '', help }
}

/** The material's permissible strain, shown beside the peak strain. */
export function strainLimitMetric(help = 'Permissible strain of the material.'): MetricSpec {
  return { key: 'strainLimit', label: 'Strain limit', unit: '', help }
}

/** Strain limit over peak strain, for a family whose range ends where the strain limit is reached ('rotation', 'travel'). */
export function strainSafetyMetric(range: string, help = `Strain limit over the peak strain; 1 when the strain limit sets the largest ${range}.`): MetricSpec {
  return { key: 'safetyFactor', label: 'Strain safety factor', unit: '', help }
}

/** Hinges plot moment against rotation. */
export const ROTATION_AXES: { displacement: AxisSpec; force: AxisSpec } = Object.freeze({
  displacement: Object.freeze({ label: 'Rotation', unit: 'deg' }),
  force: Object.freeze({ label: 'Moment', unit: 'N·mm' }),
})
