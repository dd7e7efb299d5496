/** The catalog's family definitions as JSON (everything but the functions). */
import type { z } from 'zod'
import type * as contract from '../../contract/api'
import { families, getFamily, UnknownFamilyError, type FamilyDefinition } from '../../catalog'
import { notFound } from '../errors'

export function toFamilyView(family: FamilyDefinition): FamilyView {
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
    // the family takes `wideBeam` ('auto' | 'off'): the configure form offers the choice
    bendsBeams: family.bendsBeams === true,
  }
}

/** The wire contract's family (contract/api.ts). */
export type FamilyView = z.infer<typeof contract.Family>

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
