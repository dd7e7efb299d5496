import type { CrossRule, ParamSpec } from '../../schema/types'

/** Parameters of the living hinge (leaf-spring pivot); lengths mm. */
export const params: ParamSpec[] = [
  {
    key: 'length', label: 'Blade length', unit: 'mm', default: 6, min: 1, max: 60, step: 0.1, role: 'length',
    help: 'Free length of the thin blade between the fixed and the moving link; a longer blade rotates further before reaching the strain limit.',
  },
  {
    key: 'thickness', label: 'Blade thickness', unit: 'mm', default: 0.6, min: 0.2, max: 4, step: 0.05, role: 'wall',
    help: 'In-plane thickness of the blade; stiffness grows with its cube and the largest rotation falls in proportion.',
  },
  {
    key: 'depth', label: 'Depth', unit: 'mm', default: 8, min: 1, max: 80, step: 0.5, role: 'length',
    help: 'Out-of-plane width of the hinge (the print height).',
  },
  {
    key: 'linkLength', label: 'Link length', unit: 'mm', default: 30, min: 2, max: 200, step: 0.5, role: 'length',
    help: 'Length of the rigid moving link from the end of the blade to where the force acts.',
  },
]

export const rules: CrossRule[] = [
  {
    fields: ['thickness', 'length'],
    check: (p) => (p.thickness > p.length / 4
      ? `thickness (${p.thickness} mm) must stay below a quarter of the blade length (${p.length / 4} mm) for the blade to bend as a hinge`
      : null),
  },
]
