import type { CrossRule, ParamSpec } from '../../schema/types'

/** Parameters of the circular notch hinge; lengths mm. */
export const params: ParamSpec[] = [
  {
    key: 'radius', label: 'Notch radius', unit: 'mm', default: 3, min: 0.5, max: 20, step: 0.1, role: 'length',
    help: 'Radius of the two circular cuts that form the notch, one on each side of the block.',
  },
  {
    key: 'neckThickness', label: 'Neck thickness', unit: 'mm', default: 0.8, min: 0.3, max: 10, step: 0.05, role: 'wall',
    help: 'Thinnest section between the two cuts; the hinge stiffness grows with about its 2.5th power.',
  },
  {
    key: 'depth', label: 'Depth', unit: 'mm', default: 8, min: 1, max: 60, step: 0.5, role: 'length',
    help: 'Out-of-plane size of the block (the print height); stiffness grows in proportion.',
  },
  {
    key: 'blockThickness', label: 'Block thickness', unit: 'mm', default: 8, min: 1, max: 60, step: 0.5, role: 'length',
    help: 'Overall thickness of the block across the notch. The cuts are centred radius + neckThickness/2 from the mid-plane; a block thinner than neckThickness + 2·radius gets a shallower notch.',
  },
]

export const rules: CrossRule[] = [
  {
    fields: ['neckThickness', 'blockThickness'],
    check: (p) => (p.neckThickness >= p.blockThickness
      ? `neckThickness (${p.neckThickness} mm) must be smaller than blockThickness (${p.blockThickness} mm), or there is no notch`
      : null),
  },
  {
    // The cuts must remove at least a little material on each side to act as a hinge.
    fields: ['blockThickness', 'neckThickness'],
    check: (p) => (p.blockThickness < 2 * p.neckThickness
      ? `blockThickness (${p.blockThickness} mm) must be at least twice the neckThickness (${2 * p.neckThickness} mm) for the notch to concentrate the bending`
      : null),
  },
  {
    // Paros & Weisbord tabulate up to t/R = 1; thicker necks behave as short stubby beams.
    fields: ['neckThickness', 'radius'],
    check: (p) => (p.neckThickness > 1.5 * p.radius
      ? `neckThickness (${p.neckThickness} mm) must stay below 1.5 × radius (${(1.5 * p.radius).toPrecision(3)} mm); a thicker neck is a stub, not a notch hinge`
      : null),
  },
]
