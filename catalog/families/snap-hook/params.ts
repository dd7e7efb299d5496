import type { CrossRule, ParamSpec } from '../../schema/types'
import { headFitProblem } from './layout'

/** Parameters of the cantilever snap-fit hook; lengths mm, angles degrees. */
export const params: ParamSpec[] = [
  {
    key: 'length', label: 'Arm length', unit: 'mm', default: 15, min: 4, max: 60, step: 0.5, role: 'length',
    help: 'Free length of the hook arm, from the root (where it leaves the wall) to the hook.',
  },
  {
    key: 'rootThickness', label: 'Root thickness', unit: 'mm', default: 1.6, min: 0.8, max: 6, step: 0.05, role: 'wall',
    help: 'Arm thickness at the root, in the bending direction; the root carries the peak strain.',
  },
  {
    key: 'tipThickness', label: 'Tip thickness', unit: 'mm', default: 1.1, min: 0.4, max: 6, step: 0.05, role: 'wall',
    help: 'Arm thickness at the hook; a linear taper from the root spreads the strain and allows more deflection.',
  },
  {
    key: 'width', label: 'Width', unit: 'mm', default: 6, min: 1, max: 40, step: 0.5, role: 'length',
    help: 'Width of the arm across the bending direction (usually the print height).',
  },
  {
    key: 'undercut', label: 'Undercut', unit: 'mm', default: 1.2, min: 0.1, max: 10, step: 0.05, role: 'length',
    help: 'Overhang of the hook: how far the arm must deflect to pass the mating edge.',
  },
  {
    key: 'entryAngle', label: 'Entry angle', unit: 'deg', default: 30, min: 5, max: 75, step: 1, role: 'angle',
    help: 'Angle of the lead-in face against the insertion direction; steeper faces need more force to assemble.',
  },
  {
    key: 'retainAngle', label: 'Retaining angle', unit: 'deg', default: 45, min: 5, max: 90, step: 1, role: 'angle',
    help: 'Angle of the back face; near 90° (or steep with friction) the hook locks and cannot be pulled out.',
  },
  {
    key: 'friction', label: 'Friction coefficient', unit: '', default: 0.4, min: 0, max: 1, step: 0.05, role: 'ratio',
    help: 'Coefficient of friction between hook and mating part (plastic on plastic is typically 0.2–0.6).',
  },
]

const deg = Math.PI / 180

export const rules: CrossRule[] = [
  {
    fields: ['tipThickness', 'rootThickness'],
    check: (p) => (p.tipThickness > p.rootThickness
      ? `tipThickness (${p.tipThickness} mm) must not exceed rootThickness (${p.rootThickness} mm): the arm tapers towards the hook`
      : null),
  },
  {
    // Below h/2 the bending strain peaks away from the root and the root-strain design equations no longer hold.
    fields: ['tipThickness', 'rootThickness'],
    check: (p) => (p.tipThickness < p.rootThickness / 2
      ? `tipThickness (${p.tipThickness} mm) must be at least half the rootThickness (${p.rootThickness / 2} mm), the usual taper range`
      : null),
  },
  {
    fields: ['rootThickness', 'length'],
    check: (p) => (p.rootThickness > p.length / 4
      ? `rootThickness (${p.rootThickness} mm) must stay below a quarter of the arm length (${p.length / 4} mm) for the arm to bend as a beam`
      : null),
  },
  {
    fields: ['undercut', 'length'],
    check: (p) => (p.undercut > p.length / 3
      ? `undercut (${p.undercut} mm) must stay below a third of the arm length (${(p.length / 3).toPrecision(3)} mm); larger deflections leave small-deflection beam theory`
      : null),
  },
  {
    // W = P(μ + tan α)/(1 − μ tan α) has no finite value once μ tan α reaches 1: the hook jams on entry.
    fields: ['entryAngle', 'friction'],
    check: (p) => (p.friction * Math.tan(p.entryAngle * deg) >= 0.95
      ? `entryAngle (${p.entryAngle}°) is too steep for friction ${p.friction}: friction × tan(entryAngle) must stay below 0.95 or the hook jams on entry`
      : null),
  },
  {
    // the printed head (entry face, land, retaining face) must leave most of the arm free to bend
    fields: ['undercut', 'entryAngle', 'retainAngle', 'length'],
    check: (p) => headFitProblem(p),
  },
]
