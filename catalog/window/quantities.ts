/**
 * What each kind of force window asks about, and which family metric answers it.
 * Every window quantity is a range { min?, max? } on one metric of the family (after an
 * optional sign change), so one judge serves every kind.
 */
import type { ModuleKind } from '../schema/types'

export type WindowKind = ModuleKind

export interface WindowQuantity {
  /** Key in the window JSON (`peakForce`). */
  key: string
  /** Metric key of the families of this kind that answers it (`peakForce`). */
  metric: string
  /** −1 when the window speaks of the opposite sign: holdingForce = −valleyForce. */
  sign: 1 | -1
  label: string
  unit: string
  /**
   * What a null metric means: 'missing' (no such position, e.g. a beam that springs back has
   * no second stable position — every bound fails) or 'unbounded' (a snap hook whose
   * retaining face locks has no finite separation force — a min is met, a max is not).
   */
  nullMeans: 'missing' | 'unbounded'
  /**
   * Smallest scale a one-sided margin is measured against, so that a bound of 0 still
   * gives a finite relative margin (our choice: about the resolution of a bench test).
   */
  scaleFloor: number
}

const FORCE_FLOOR = 0.1 // N
const LENGTH_FLOOR = 0.1 // mm

export const windowQuantities: Readonly<Record<WindowKind, readonly WindowQuantity[]>> = Object.freeze({
  bistable: [
    { key: 'peakForce', metric: 'peakForce', sign: 1, label: 'Peak force', unit: 'N', nullMeans: 'missing', scaleFloor: FORCE_FLOOR },
    { key: 'holdingForce', metric: 'valleyForce', sign: -1, label: 'Holding force', unit: 'N', nullMeans: 'missing', scaleFloor: FORCE_FLOOR },
    { key: 'travel', metric: 'secondStablePosition', sign: 1, label: 'Travel to the second position', unit: 'mm', nullMeans: 'missing', scaleFloor: LENGTH_FLOOR },
  ],
  spring: [
    { key: 'stiffness', metric: 'stiffness', sign: 1, label: 'Stiffness', unit: 'N/mm', nullMeans: 'missing', scaleFloor: 0.001 },
    { key: 'travel', metric: 'maxTravel', sign: 1, label: 'Travel', unit: 'mm', nullMeans: 'missing', scaleFloor: LENGTH_FLOOR },
  ],
  guide: [
    { key: 'stiffness', metric: 'stiffness', sign: 1, label: 'Stiffness', unit: 'N/mm', nullMeans: 'missing', scaleFloor: 0.001 },
    { key: 'travel', metric: 'maxTravel', sign: 1, label: 'Travel', unit: 'mm', nullMeans: 'missing', scaleFloor: LENGTH_FLOOR },
  ],
  hinge: [
    { key: 'rotationalStiffness', metric: 'rotationalStiffness', sign: 1, label: 'Rotational stiffness', unit: 'N·mm/rad', nullMeans: 'missing', scaleFloor: 0.1 },
    { key: 'rotation', metric: 'maxRotation', sign: 1, label: 'Rotation', unit: 'deg', nullMeans: 'missing', scaleFloor: 0.5 },
  ],
  latch: [
    { key: 'matingForce', metric: 'matingForce', sign: 1, label: 'Mating force', unit: 'N', nullMeans: 'missing', scaleFloor: FORCE_FLOOR },
    { key: 'separationForce', metric: 'separationForce', sign: 1, label: 'Separation force', unit: 'N', nullMeans: 'unbounded', scaleFloor: FORCE_FLOOR },
  ],
})

export const windowKinds = Object.freeze(Object.keys(windowQuantities) as WindowKind[])

/**
 * Family kinds (FamilyDefinition.kind) a window of this kind is answered by. One to one
 * today; a list so that, say, a guide window could one day also consider springs.
 */
export const familyKindsForWindow: Readonly<Record<WindowKind, readonly WindowKind[]>> = Object.freeze({
  bistable: ['bistable'],
  spring: ['spring'],
  guide: ['guide'],
  hinge: ['hinge'],
  latch: ['latch'],
})

export function quantitiesOf(kind: WindowKind): readonly WindowQuantity[] {
  return windowQuantities[kind]
}
