import { defineFamily } from '../../schema/define'
import * as geometry from './geometry'
import * as model from './model'
import * as params from './params'
import { estimator } from './search'

export const serpentineSpring = defineFamily({
  id: 'serpentine-spring',
  name: 'Serpentine spring',
  kind: 'spring',
  summary: 'A meander of thin spans between two pads: a soft, compact return spring printed flat in one piece.',
  defaultMethod: 'nonlinear-fe',
  search: { estimator },
  designMap: { sweep: ['spanLength', 'thickness'] },
  bendsBeams: true,
  cautions: [
    'The peak strain is checked against the material\u2019s strain limit shown with the result; a spring cycled many times should stay well below it, since polymers fatigue at strains far under their one-off limit.',
    'Polymers creep: a spring held stretched relaxes, loses preload and takes a set, faster when warm; do not rely on a printed spring for a lasting preload.',
    'These are beam-theory estimates; printed spans vary in thickness and stiffness grows with its cube. Confirm on printed parts, and defer to qualified review where a failure could hurt someone.',
  ],
}, { params, model, geometry })
