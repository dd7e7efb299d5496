/**
 * A test report's measured curve against the predicted curve of the revision it tested,
 * through the catalog's comparison (catalog/calibration). The predicted modulus is the one
 * the revision's material resolves to among the curated materials.
 */
import { compareToPrediction, families, validateParams, type CurveComparison } from '../../catalog'
import type { EntryRevision, TestReport } from '../db'

export interface ReportComparison extends CurveComparison {
  revisionId: number
  revisionNumber: number
  /** Which material the prediction used (id null for a custom modulus). */
  predictedMaterial: { id: string | null; name: string; modulus: number }
}

/** What a comparison reads of the revision a report tested (plain data, so it can go to a worker). */
export type ComparedRevision = Pick<EntryRevision, 'id' | 'number' | 'params' | 'curve'>

export type MaterialNumbers = Array<{ id: string; name: string; modulus: number; strainLimit: number; poissonRatio?: number }>

export function predictedMaterialOf(familyId: string, revision: Pick<EntryRevision, 'params'>, materials: MaterialNumbers) {
  const family = families.find((f) => f.id === familyId)
  if (!family) return null
  try {
    const { material } = validateParams(family, revision.params, { materials })
    return material
  } catch {
    return null
  }
}

/** null (with the reason) when the family is gone or the revision's material no longer resolves. */
export function compareReport(familyId: string, report: Pick<TestReport, 'measuredCurve'>, revision: ComparedRevision, materials: MaterialNumbers): { comparison: ReportComparison | null; problem: string | null } {
  const family = families.find((f) => f.id === familyId)
  if (!family) return { comparison: null, problem: `the module family "${familyId}" is no longer registered` }
  const material = predictedMaterialOf(familyId, revision, materials)
  if (!material) return { comparison: null, problem: `the material of revision ${revision.number} no longer resolves` }
  const comparison = compareToPrediction(report.measuredCurve, revision.curve, {
    predictedModulus: material.modulus,
    hasValley: family.metrics.some((m) => m.key === 'valleyForce'),
  })
  return {
    comparison: { ...comparison, revisionId: revision.id, revisionNumber: revision.number, predictedMaterial: { id: material.id, name: material.name, modulus: material.modulus } },
    problem: null,
  }
}
