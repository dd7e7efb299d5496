import { defineFamily } from '../../schema/define'
import * as geometry from './geometry'
import * as model from './model'
import * as params from './params'
import { estimator } from './search'

export const leafHinge = defineFamily({
  id: 'leaf-hinge',
  name: 'Living hinge',
  kind: 'hinge',
  summary: 'A thin blade between a fixed and a moving link: a one-piece pivot for lids, doors and flaps.',
  defaultMethod: 'nonlinear-fe',
  search: { estimator },
  designMap: { sweep: ['length', 'thickness'] },
  bendsBeams: true,
  cautions: [
    'The blade strain is checked against the material\u2019s strain limit shown with the result; a hinge opened and closed many times fatigues at strains far below its one-off limit, so keep a margin, and prefer tough materials (PP, PETG, PA) over brittle ones.',
    'Polymers creep: a hinge held bent (a lid kept open) takes a set and its return force fades, faster when warm.',
    'These are estimates for a blade bending in the build plane; printed blades vary in thickness and layer bonding, and a blade bent across its layers may split. Confirm stiffness and range on printed parts, and defer to qualified review where a failure could hurt someone.',
  ],
}, { params, model, geometry })
