import type { CrossRule, ParamSpec } from '../../../catalog/schema/types'

/** A made-up family for the registry test: one straight cantilever blade on a base block; lengths mm. */
export const params: ParamSpec[] = [
  { key: 'length', label: 'Blade length', unit: 'mm', default: 20, min: 5, max: 80, step: 0.5, role: 'length', help: 'Free length of the blade from the base to the loaded tip.' },
  { key: 'thickness', label: 'Blade thickness', unit: 'mm', default: 1, min: 0.4, max: 4, step: 0.05, role: 'wall', help: 'In-plane thickness of the blade.' },
  { key: 'depth', label: 'Depth', unit: 'mm', default: 6, min: 1, max: 30, step: 0.5, role: 'length', help: 'Out-of-plane size of the blade (the print height).' },
]

export const rules: CrossRule[] = [
  {
    fields: ['thickness', 'length'],
    check: (p) => (p.thickness > p.length / 8 ? `thickness (${p.thickness} mm) must stay below an eighth of the blade length (${p.length / 8} mm) for the blade to bend as a slender beam` : null),
  },
]
