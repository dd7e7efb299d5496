/**
 * The demo shelf: an invented small company that designs 3D-printed enclosures for
 * outdoor sensor nodes (trail counters, soil probes, weather masts). All names are made
 * up. Entries are keyed by family id and seeded only once their family is registered.
 */
import type { Role } from '../roles'

export const DEMO_PASSWORD = 'flexshelf-demo'

export interface DemoUser {
  email: string
  displayName: string
  role: Role
}

export const DEMO_USERS: readonly DemoUser[] = [
  { email: 'engineer@demo.flexshelf.test', displayName: 'Tamsin Orel', role: 'engineer' },
  { email: 'contributor@demo.flexshelf.test', displayName: 'Bram Kettleby', role: 'contributor' },
  { email: 'librarian@demo.flexshelf.test', displayName: 'Lio Fennick', role: 'librarian' },
  { email: 'admin@demo.flexshelf.test', displayName: 'Ada Quillon', role: 'admin' },
]

export interface DemoEntry {
  name: string
  summary: string
  tags: string[]
  status: 'draft' | 'released'
  /** E-mail of the demo user who owns it (librarians curate released entries). */
  owner: string
  defaultParams: Record<string, number | string>
  /** Allowed ranges; the seed narrows each to the family's own limits. */
  ranges: Record<string, [number, number]>
  materials: string[]
  notes: string
}

const LIBRARIAN = 'librarian@demo.flexshelf.test'
const CONTRIBUTOR = 'contributor@demo.flexshelf.test'

const PRINT_NOTE = 'Print flat with the bending plane in the build plane, 100 % infill, at least two perimeters across every flexure.'

export const DEMO_SHELF: Readonly<Record<string, readonly DemoEntry[]>> = {
  'bistable-beam': [
    {
      name: 'Power switch, field node shell S1',
      summary: 'Push-on / push-off bistable switch moulded into the lid of the S1 trail-counter shell; a gloved thumb snaps it over.',
      tags: ['switch', 'power', 'lid', 'S1'],
      status: 'released',
      owner: LIBRARIAN,
      defaultParams: { span: 60, apexHeight: 2.1, thickness: 0.7, depth: 6, postLength: 0, material: 'petg' },
      ranges: { span: [50, 70], apexHeight: [1.8, 2.6], thickness: [0.6, 0.9], depth: [4, 8], postLength: [0, 3] },
      materials: ['petg', 'abs'],
      notes: `Carries the battery-disconnect contact on the shuttle. ${PRINT_NOTE}`,
    },
    {
      name: 'Tamper latch, gateway lid G2',
      summary: 'Bistable tell-tale under the G2 gateway lid: it flips over when the lid is forced and stays flipped until reset.',
      tags: ['latch', 'tamper', 'lid', 'G2'],
      status: 'released',
      owner: LIBRARIAN,
      defaultParams: { span: 45, apexHeight: 2.4, thickness: 0.6, depth: 4, postLength: 1.5, material: 'pa12' },
      ranges: { span: [40, 52], apexHeight: [2, 2.8], thickness: [0.5, 0.7], depth: [3, 6], postLength: [0, 3] },
      materials: ['pa12', 'petg'],
      notes: 'Short side posts soften the snap so a lid pried open by a few millimetres already trips it; longer posts lose the second position. Powder-bed fusion parts: no orientation limit.',
    },
    {
      name: 'Soft-touch switch, soil probe P3 (proposal)',
      summary: 'A lighter snap for the P3 soil-probe cap, proposed after field staff found the S1 switch stiff in the cold.',
      tags: ['switch', 'power', 'cap', 'P3'],
      status: 'draft',
      owner: CONTRIBUTOR,
      defaultParams: { span: 60, apexHeight: 2.1, thickness: 0.6, depth: 5, postLength: 1, material: 'petg' },
      ranges: { span: [50, 70], apexHeight: [1.8, 2.6], thickness: [0.5, 0.8], depth: [4, 6], postLength: [0, 2] },
      materials: ['petg'],
      notes: 'Not yet printed; measured curves to follow.',
    },
  ],
  'leaf-hinge': [
    {
      name: 'Battery door hinge, field node shell S1',
      summary: 'Living hinge joining the AA battery door to the S1 shell; opened a few times a year for battery swaps.',
      tags: ['hinge', 'battery door', 'S1'],
      status: 'released',
      owner: LIBRARIAN,
      defaultParams: { length: 4, thickness: 0.6, depth: 20, linkLength: 25, material: 'pp' },
      ranges: { length: [3, 6], thickness: [0.4, 0.8], depth: [12, 30], linkLength: [15, 35] },
      materials: ['pp', 'petg'],
      notes: `Polypropylene takes repeated bending best. ${PRINT_NOTE}`,
    },
  ],
  'notch-hinge': [
    {
      name: 'Solar panel tilt pivot, weather mast W1',
      summary: 'Circular notch pivot that lets the W1 mast solar panel settle a few degrees into its clamp.',
      tags: ['pivot', 'solar', 'W1'],
      status: 'released',
      owner: LIBRARIAN,
      defaultParams: { radius: 2, neckThickness: 0.8, depth: 8, blockThickness: 6, material: 'petg' },
      ranges: { radius: [1.5, 3], neckThickness: [0.6, 1.2], depth: [6, 12], blockThickness: [5, 8] },
      materials: ['petg', 'abs'],
      notes: 'Small rotation only; a notch concentrates strain at the neck, so check the safety factor for the clamp angle.',
    },
  ],
  'parallel-guide': [
    {
      name: 'Rain sensor plunger guide, weather mast W1',
      summary: 'Two parallel blades guiding the W1 rain-sensor plunger straight up and down without sliding friction.',
      tags: ['guide', 'sensor', 'W1'],
      status: 'released',
      owner: LIBRARIAN,
      defaultParams: { length: 20, thickness: 0.8, depth: 6, spacing: 14, material: 'petg' },
      ranges: { length: [15, 25], thickness: [0.6, 1.2], depth: [4, 10], spacing: [10, 20] },
      materials: ['petg', 'pa12'],
      notes: `Keep the travel small against the blade length so the parasitic motion stays below the plunger clearance. ${PRINT_NOTE}`,
    },
  ],
  'serpentine-spring': [
    {
      name: 'Status button return spring, gateway G2',
      summary: 'Meander spring that returns the G2 status button; printed in one piece with the button cap.',
      tags: ['spring', 'button', 'G2'],
      status: 'released',
      owner: LIBRARIAN,
      defaultParams: { spans: 5, spanLength: 8, pitch: 2, thickness: 0.6, depth: 4, material: 'petg' },
      ranges: { spans: [3, 7], spanLength: [6, 10], pitch: [1.5, 3], thickness: [0.5, 0.8], depth: [3, 6] },
      materials: ['petg', 'pa12'],
      notes: PRINT_NOTE,
    },
  ],
  'snap-hook': [
    {
      name: 'Battery door snap hook, field node shell S1',
      summary: 'Cantilever hook that keeps the S1 battery door shut; released by pressing the door tab.',
      tags: ['latch', 'battery door', 'S1'],
      status: 'released',
      owner: LIBRARIAN,
      defaultParams: { length: 12, rootThickness: 1.6, tipThickness: 1, width: 6, undercut: 0.8, entryAngle: 30, retainAngle: 60, friction: 0.4, material: 'petg' },
      ranges: { length: [9, 16], rootThickness: [1.2, 2], tipThickness: [0.8, 1.4], width: [4, 8], undercut: [0.5, 1.2], entryAngle: [20, 40], retainAngle: [45, 75], friction: [0.2, 0.6] },
      materials: ['petg', 'abs', 'pa12'],
      notes: 'A door opened a few times a year: size the strain for repeated assembly (about 60 % of the one-off value).',
    },
    {
      name: 'Cable clip latch, sensor harness',
      summary: 'Snap hook closing the harness clips along the mast; opened only when a cable is replaced.',
      tags: ['latch', 'cable clip', 'harness'],
      status: 'released',
      owner: LIBRARIAN,
      defaultParams: { length: 8, rootThickness: 1.2, tipThickness: 0.8, width: 5, undercut: 0.6, entryAngle: 35, retainAngle: 80, friction: 0.3, material: 'pa12' },
      ranges: { length: [6, 10], rootThickness: [1, 1.6], tipThickness: [0.6, 1.2], width: [4, 7], undercut: [0.4, 0.9], entryAngle: [25, 45], retainAngle: [60, 90], friction: [0.2, 0.5] },
      materials: ['pa12', 'petg'],
      notes: 'Steep retaining face: opening it needs a screwdriver tip, which is intended.',
    },
  ],
}
