import type { CrossRule, ParamSpec } from '../../schema/types'

/** Parameters of the parallel-blade straight-line guide; lengths mm. */
export const params: ParamSpec[] = [
  {
    key: 'length', label: 'Blade length', unit: 'mm', default: 30, min: 5, max: 150, step: 0.5, role: 'length',
    help: 'Free length of each blade between the base and the stage.',
  },
  {
    key: 'thickness', label: 'Blade thickness', unit: 'mm', default: 0.8, min: 0.3, max: 5, step: 0.05, role: 'wall',
    help: 'In-plane thickness of each blade; stiffness grows with its cube, so print it as a whole number of perimeters.',
  },
  {
    key: 'depth', label: 'Depth', unit: 'mm', default: 8, min: 1, max: 60, step: 0.5, role: 'length',
    help: 'Out-of-plane size of the blades (the print height).',
  },
  {
    key: 'spacing', label: 'Blade spacing', unit: 'mm', default: 20, min: 2, max: 150, step: 0.5, role: 'length',
    help: 'Centre distance between the two blades; a wider spacing holds the stage straighter against tilting loads.',
  },
]

export const rules: CrossRule[] = [
  {
    fields: ['thickness', 'length'],
    check: (p) => (p.thickness > p.length / 10
      ? `thickness (${p.thickness} mm) must stay below a tenth of the blade length (${p.length / 10} mm) for the blades to bend as slender beams`
      : null),
  },
  {
    fields: ['spacing', 'thickness'],
    check: (p) => (p.spacing < 4 * p.thickness
      ? `spacing (${p.spacing} mm) must be at least four blade thicknesses (${4 * p.thickness} mm) to leave a printable gap between the blades`
      : null),
  },
]
