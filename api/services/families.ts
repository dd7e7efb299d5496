/** The catalog's family definitions as JSON (everything but the functions). */
import { families, getFamily, UnknownFamilyError, type FamilyDefinition } from '../../catalog'
import { notFound } from '../errors'

export function toFamilyView(family: FamilyDefinition) {
  return {
    id: family.id,
    name: family.name,
    kind: family.kind,
    summary: family.summary,
    params: family.params,
    rules: family.rules.map((rule) => ({ fields: rule.fields })),
    methods: family.methods,
    defaultMethod: family.defaultMethod,
    metrics: family.metrics,
    axes: family.axes,
    cautions: family.cautions,
    designMap: family.designMap ?? null,
  }
}

export type FamilyView = ReturnType<typeof toFamilyView>

export function listFamilies(): FamilyView[] {
  return families.map(toFamilyView)
}

export function findFamily(familyId: string): FamilyDefinition {
  try {
    return getFamily(familyId)
  } catch (err) {
    if (err instanceof UnknownFamilyError) throw notFound(`module family "${familyId}"`)
    throw err
  }
}
