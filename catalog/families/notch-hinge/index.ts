import { defineFamily } from '../../schema/define'
import * as geometry from './geometry'
import * as model from './model'
import * as params from './params'
import { estimator } from './search'

export const notchHinge = defineFamily({
  id: 'notch-hinge',
  name: 'Circular notch hinge',
  kind: 'hinge',
  summary: 'A block with two circular cuts leaving a thin neck: a compact, precise pivot for small rotations.',
  defaultMethod: 'paros-weisbord',
  search: { estimator },
  designMap: { sweep: ['radius', 'neckThickness'] },
  bendsBeams: true,
  cautions: [
    'The neck strain is checked against the material\u2019s strain limit shown with the result; a hinge cycled many times should stay well below it, since polymers fatigue at strains far under their one-off limit.',
    'Polymers creep: a notch held bent relaxes and takes a set, faster when warm, so a hinge that must return to zero should not be parked under load.',
    'These are estimates from beam theory for a notch cut cleanly in solid material; a printed neck only a few extrusion widths thick departs from it. Confirm stiffness and range on printed parts, and defer to qualified review where a failure could hurt someone.',
  ],
}, { params, model, geometry })
