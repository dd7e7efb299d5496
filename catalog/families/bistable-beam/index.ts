import { defineFamily } from '../../schema/define'
import * as geometry from './geometry'
import * as model from './model'
import * as params from './params'
import { estimator } from './search'
import { estimateAllowance } from './tolerance'

export { estimateBistable } from './estimate'

export const bistableBeam = defineFamily({
  id: 'bistable-beam',
  name: 'Bistable curved-beam switch',
  kind: 'bistable',
  summary: 'Two cosine-shaped beams joined by a shuttle at mid-span: pushed past the apex they snap through and hold a second position, for push switches and toggles.',
  defaultMethod: 'nonlinear-fe',
  search: { estimator },
  tolerance: { estimateAllowance },
  designMap: { sweep: ['apexHeight', 'thickness'] },
  bendsBeams: true,
  cautions: [
    'These are estimates from beam theory for the nominal geometry; printed beams vary in thickness (force grows with its cube), layer bonding and modulus. Confirm the snap force and the second position on printed parts before relying on them.',
    'Polymers creep: a switch held in its second position, or pressed for long, relaxes and loses snap force, faster when warm; a part near the bistability limit may stop holding its second position.',
    'Each snap cycles the beams through their largest strain; fatigue life falls steeply with strain, so keep the strain safety factor well above 1 for parts that switch often, and defer to qualified review where a failure could hurt someone.',
  ],
}, { params, model, geometry })
