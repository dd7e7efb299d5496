import type { CrossRule, ParamSpec } from '../../schema/types'

/** Parameters of the meander (serpentine) spring; lengths mm. */
export const params: ParamSpec[] = [
  {
    key: 'spans', label: 'Spans', unit: '', default: 5, min: 2, max: 15, step: 1, integer: true, role: 'count',
    help: 'Number of straight beams across the spring axis; more spans make a softer spring.',
  },
  {
    key: 'spanLength', label: 'Span length', unit: 'mm', default: 12, min: 3, max: 60, step: 0.5, role: 'length',
    help: 'Length of each span across the axis (centreline to centreline of the connectors).',
  },
  {
    key: 'pitch', label: 'Pitch', unit: 'mm', default: 2.4, min: 0.8, max: 20, step: 0.1, role: 'length',
    help: 'Centre distance between neighbouring spans, which is also the length of each connector along the axis.',
  },
  {
    key: 'thickness', label: 'Thickness', unit: 'mm', default: 0.8, min: 0.3, max: 4, step: 0.05, role: 'wall',
    help: 'In-plane thickness of spans and connectors; stiffness grows with its cube.',
  },
  {
    key: 'depth', label: 'Depth', unit: 'mm', default: 6, min: 1, max: 40, step: 0.5, role: 'length',
    help: 'Out-of-plane size of the spring (the print height).',
  },
]

/** Smallest gap between neighbouring spans that prints cleanly: about one extrusion width (common practice). */
const MIN_GAP = 0.4

export const rules: CrossRule[] = [
  {
    fields: ['pitch', 'thickness'],
    check: (p) => (p.pitch - p.thickness < MIN_GAP
      ? `pitch (${p.pitch} mm) must exceed the thickness (${p.thickness} mm) by at least ${MIN_GAP} mm so the gap between spans prints open`
      : null),
  },
  {
    fields: ['thickness', 'spanLength'],
    check: (p) => (p.thickness > p.spanLength / 8
      ? `thickness (${p.thickness} mm) must stay below an eighth of the span length (${p.spanLength / 8} mm) for the spans to bend as slender beams`
      : null),
  },
  {
    fields: ['pitch', 'spanLength'],
    check: (p) => (p.pitch > p.spanLength
      ? `pitch (${p.pitch} mm) must not exceed the span length (${p.spanLength} mm); with longer connectors the part is no longer a meander`
      : null),
  },
]
