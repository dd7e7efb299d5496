import { defineFamily } from '../../schema/define'
import * as geometry from './geometry'
import * as model from './model'
import * as params from './params'
import { estimator } from './search'

export const snapHook = defineFamily({
  id: 'snap-hook',
  name: 'Cantilever snap hook',
  kind: 'latch',
  summary: 'A tapered cantilever arm with a hook that deflects over a lead-in face and catches behind an undercut: lids, battery doors, cable clips.',
  defaultMethod: 'snap-fit-equations',
  search: { estimator },
  designMap: { sweep: ['length', 'rootThickness'] },
  bendsBeams: true,
  cautions: [
    'The root strain is checked against the material\u2019s strain limit shown with the result; for a hook that is assembled and released many times, keep the root strain to about 60 % of a single-assembly limit (suppliers\u2019 guides, from memory).',
    'Polymers creep: a latch held deflected, or holding a preloaded lid, relaxes over time and loses holding force, faster when warm; design the hook to sit unstrained when engaged.',
    'These are beam-theory estimates. Printed parts vary with printer, orientation and layer adhesion (a hook bent across its layers may split): confirm forces and strength on printed parts, and defer to qualified review where a failure could hurt someone.',
  ],
}, { params, model, geometry })
