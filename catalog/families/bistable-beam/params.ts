import { nearlyEqual } from '../../numeric'
import type { CrossRule, ParamSpec } from '../../schema/types'

/** Parameters of the bistable curved-beam pair; lengths mm. */
export const params: ParamSpec[] = [
  {
    key: 'span', label: 'Span', unit: 'mm', default: 60, min: 10, max: 150, step: 0.5, role: 'length',
    help: 'Distance between the two fixed ends of each curved beam; the shuttle sits at mid-span. Force falls with the cube of the span.',
  },
  {
    key: 'apexHeight', label: 'Apex height', unit: 'mm', default: 2.5, min: 0.3, max: 30, step: 0.05, role: 'length',
    help: 'Rise of the cosine-shaped beam at mid-span. The shuttle travels twice this far; the ratio to the thickness decides whether the part is bistable (above about 2.3).',
  },
  {
    key: 'thickness', label: 'Beam thickness', unit: 'mm', default: 0.8, min: 0.2, max: 5, step: 0.05, role: 'wall',
    help: 'In-plane thickness of each beam (printed as walls). Force grows with its cube; print it as a whole number of perimeters.',
  },
  {
    key: 'depth', label: 'Depth', unit: 'mm', default: 6, min: 1, max: 50, step: 0.5, role: 'length',
    help: 'Out-of-plane width of the beams (the print height); force grows in proportion.',
  },
  {
    key: 'postLength', label: 'Side post length', unit: 'mm', default: 0, min: 0, max: 40, step: 0.5, role: 'length',
    help: 'Length of the compliant vertical post carrying each beam end (same thickness and depth as the beam); 0 clamps the ends rigidly to the frame. Posts lower the force and can remove bistability.',
  },
]

/** Outside these ratios the beam models stop applying (slender, shallow beams; Qiu et al. 2004). */
export const MIN_RATIO = 1.5
export const MAX_RATIO = 15
export const MAX_RISE = 0.2
export const MIN_SLENDERNESS = 20
export const MAX_POST = 0.5
/** Shorter posts are below one printed layer or line (common practice): they cannot be made, and the beam mesh would degenerate. */
const MIN_POST = 0.1

const fmt = (v: number) => String(Number(v.toPrecision(4)))

export const rules: CrossRule[] = [
  {
    fields: ['apexHeight', 'thickness'],
    check: (p) => {
      const q = p.apexHeight / p.thickness
      // compared through nearlyEqual so a ratio on the boundary (0.3 / 0.2) is not refused by rounding
      if (q < MIN_RATIO && !nearlyEqual(q, MIN_RATIO)) return `apexHeight must be at least ${MIN_RATIO} × the thickness (now ${fmt(q)} ×, ${fmt(MIN_RATIO * p.thickness)} mm for this thickness): flatter beams hardly snap`
      if (q > MAX_RATIO && !nearlyEqual(q, MAX_RATIO)) return `apexHeight must be at most ${MAX_RATIO} × the thickness (now ${fmt(q)} ×, ${fmt(MAX_RATIO * p.thickness)} mm for this thickness): taller arches strain past printable limits`
      return null
    },
  },
  {
    fields: ['apexHeight', 'span'],
    check: (p) => (p.apexHeight > MAX_RISE * p.span
      ? `apexHeight must be well below the span: at most ${MAX_RISE * 100} % of it (${fmt(MAX_RISE * p.span)} mm for a ${fmt(p.span)} mm span), so the beam stays a shallow arch`
      : null),
  },
  {
    fields: ['thickness', 'span'],
    check: (p) => (p.thickness > p.span / MIN_SLENDERNESS
      ? `thickness must be well below the span: at most 1/${MIN_SLENDERNESS} of it (${fmt(p.span / MIN_SLENDERNESS)} mm for a ${fmt(p.span)} mm span), so the beam bends as a slender beam`
      : null),
  },
  {
    fields: ['postLength'],
    check: (p) => (p.postLength > 0 && p.postLength < MIN_POST
      ? `postLength must be 0 (ends clamped to the frame) or at least ${MIN_POST} mm: a shorter post cannot be printed apart from the frame`
      : null),
  },
  {
    fields: ['postLength', 'span'],
    check: (p) => (p.postLength > MAX_POST * p.span
      ? `postLength must be at most half the span (${fmt(MAX_POST * p.span)} mm for a ${fmt(p.span)} mm span)`
      : null),
  },
]
