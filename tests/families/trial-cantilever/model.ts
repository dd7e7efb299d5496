/**
 * A made-up family's model: a prismatic cantilever with a force at its free end, linear beam
 * theory. Stiffness k = 3EI/L³ with I = b t³/12 (Roark's Formulas for Stress and Strain, 7th ed.,
 * Table 8.1 case 1a); root strain ε = Mc/(EI) = 3 t δ / (2 L²). The travel stops where the root
 * reaches the strain limit, or at a fifth of the length, where small-deflection theory still holds
 * to a few per cent (common practice).
 */
import { peakStrainMetric, strainSafetyMetric } from '../../../catalog/schema/define'
import type { MethodInfo, MetricSpec, ModelInput, ModelOutput } from '../../../catalog/schema/types'

const TRAVEL_CAP = 0.2
const POINTS = 21

export const methods: MethodInfo[] = [
  { id: 'linear', label: 'Linear beam theory', source: 'Roark\u2019s Formulas for Stress and Strain (Young & Budynas, 7th ed., 2002), Table 8.1 case 1a: cantilever, end load' },
]

export const metrics: MetricSpec[] = [
  { key: 'stiffness', label: 'Stiffness', unit: 'N/mm', help: 'Tip force per mm of tip deflection.' },
  { key: 'maxTravel', label: 'Largest travel', unit: 'mm', help: 'Tip deflection at the strain limit (or the end of the working range).' },
  peakStrainMetric('Bending strain at the blade root at the largest travel (a fraction).'),
  strainSafetyMetric('travel'),
]

export const axes = { displacement: { label: 'Tip deflection', unit: 'mm' }, force: { label: 'Force', unit: 'N' } }

export function stiffnessOf(p: Record<string, number>, modulus: number): number {
  return (3 * modulus * ((p.depth * p.thickness ** 3) / 12)) / p.length ** 3
}

export function strainPerMm(p: Record<string, number>): number {
  return (3 * p.thickness) / (2 * p.length ** 2)
}

export function travelOf(p: Record<string, number>, strainLimit: number): number {
  return Math.min(strainLimit / strainPerMm(p), TRAVEL_CAP * p.length)
}

export function evaluate({ params: p, material }: ModelInput): ModelOutput {
  const k = stiffnessOf(p, material.modulus)
  const travel = travelOf(p, material.strainLimit)
  const displacement = Array.from({ length: POINTS }, (_, i) => (travel * i) / (POINTS - 1))
  const strain = displacement.map((d) => d * strainPerMm(p))
  const peak = strain[POINTS - 1]
  return {
    curve: { displacement, force: displacement.map((d) => k * d), strain, axes },
    metrics: { stiffness: k, maxTravel: travel, maxStrain: peak, safetyFactor: material.strainLimit / peak },
    warnings: [],
  }
}
