import { defineFamily } from '../../schema/define'
import * as geometry from './geometry'
import * as model from './model'
import * as params from './params'
import { estimator } from './search'

export const parallelGuide = defineFamily({
  id: 'parallel-guide',
  name: 'Parallel-blade guide',
  kind: 'guide',
  summary: 'Two parallel blades carrying a stage: a straight-line guide without sliding parts, with a small known parasitic motion.',
  defaultMethod: 'nonlinear-fe',
  search: { estimator },
  designMap: { sweep: ['length', 'thickness'] },
  bendsBeams: true,
  cautions: [
    'The blade strain is checked against the material\u2019s strain limit shown with the result; a guide cycled many times should stay well below it, since polymers fatigue at strains far under their one-off limit.',
    'Polymers creep: a stage held off its rest position drifts and the guide takes a set, faster when warm.',
    'These are beam-theory estimates; printed blades vary in thickness and stiffness grows with its cube. Confirm on printed parts, and defer to qualified review where a failure could hurt someone.',
  ],
}, { params, model, geometry })
