/**
 * The demo's activity: what each role would find on a first start so that every screen has
 * something on it. All of it is the same invented scenario as the demo shelf (demo-shelf.ts),
 * marked as demo where people read it; the test curves are generated from the model
 * (demo-measurement.ts), never measured, and their notes say so.
 *
 * - a change proposal of the contributor's, submitted and waiting for review, with a comment thread;
 * - a test report on the power switch, accepted, whose curve lies under the prediction (a
 *   softer print) so the fitted modulus differs visibly from the nominal one;
 * - a second report, on the battery door hinge, waiting for review;
 * - a retired entry (the first battery door hinge, replaced);
 * - the notification e-mails those steps would have sent, in the local outbox;
 * - a saved configuration of the engineer's, and a second one shared by a link.
 */
import type { SyntheticMeasurement } from './demo-measurement'
import type { CommentKind } from './models/entry-comment'
import type { DemoEntry } from './demo-shelf'
import { createHash } from 'node:crypto'

/**
 * A demo report's stored file key, in the same shape as an uploaded one (reports/ and 32 hex
 * digits: the file stores refuse anything else) and the same on every start, so the seed finds
 * the report it made before.
 */
function demoFileKey(name: string): string {
  return `reports/${createHash('md5').update(`flexshelf-demo-report:${name}`).digest('hex')}.csv`
}

const LIBRARIAN = 'librarian@demo.flexshelf.test'
const CONTRIBUTOR = 'contributor@demo.flexshelf.test'
const ENGINEER = 'engineer@demo.flexshelf.test'

/** Said in every demo report's notes and every demo e-mail. */
export const DEMO_MARK = 'Demo data: an invented scenario.'

export interface DemoActivityEntry extends Omit<DemoEntry, 'status'> {
  familyId: string
  status: 'in_review' | 'retired'
  /** The thread on it, oldest first, each a few hours after the one before. */
  comments: Array<{ author: string; kind: CommentKind; text: string }>
}

export const DEMO_ACTIVITY_ENTRIES: readonly DemoActivityEntry[] = [
  {
    familyId: 'serpentine-spring',
    name: 'Softer return spring, status button G2 (demo proposal)',
    summary: 'Seven meanders instead of five so the G2 status button needs less push; proposed after a field visit found the button tiring to hold.',
    tags: ['spring', 'button', 'G2', 'demo'],
    status: 'in_review',
    owner: CONTRIBUTOR,
    defaultParams: { spans: 7, spanLength: 8, pitch: 2, thickness: 0.6, depth: 4, material: 'petg' },
    ranges: { spans: [5, 7], spanLength: [6, 10], pitch: [1.5, 3], thickness: [0.5, 0.8], depth: [3, 6] },
    materials: ['petg'],
    notes: `${DEMO_MARK} Same cap and footprint as the released spring; only the number of meanders changes.`,
    comments: [
      { author: CONTRIBUTOR, kind: 'comment', text: 'Submitting this for review: the field team asked for a lighter button on the G2. Two more meanders roughly halve the stiffness at the same footprint.' },
      { author: LIBRARIAN, kind: 'comment', text: 'Thanks. Does the longer spring still fit under the cap at full press? Please add the compressed length to the notes.' },
      { author: CONTRIBUTOR, kind: 'comment', text: 'Yes: the cap stops the button at 1.5 mm of travel, well inside the working range shown on the curve. Notes to follow with the first printed sample.' },
    ],
  },
  {
    familyId: 'leaf-hinge',
    name: 'Battery door hinge, S1 first field trial (retired)',
    summary: 'The first living hinge of the S1 battery door, in PETG. Retired after the field trial: replaced by the polypropylene hinge.',
    tags: ['hinge', 'battery door', 'S1', 'demo'],
    status: 'retired',
    owner: LIBRARIAN,
    defaultParams: { length: 5, thickness: 0.5, depth: 20, linkLength: 25, material: 'petg' },
    ranges: { length: [4, 6], thickness: [0.4, 0.6], depth: [16, 24], linkLength: [20, 30] },
    materials: ['petg'],
    notes: `${DEMO_MARK} Retired: PETG living hinges whitened and cracked after repeated battery swaps in the cold; use "Battery door hinge, field node shell S1" (polypropylene).`,
    comments: [
      { author: LIBRARIAN, kind: 'comment', text: 'Retiring this one: the polypropylene hinge replaces it. Kept on the shelf so old build sheets still resolve.' },
    ],
  },
]

export interface DemoReport {
  /** The released demo entry the report is on (by name). */
  entry: string
  uploader: string
  /** Set for an accepted report. */
  reviewer?: string
  reviewNote?: string
  status: 'submitted' | 'accepted'
  /** A fixed object key, so a second start finds the file and the row it already wrote. */
  filePath: string
  originalName: string
  printer: string
  material: string
  lot: string
  orientation: string
  testSpeed: number
  /** How the curve is generated from the model (demo-measurement.ts). */
  measurement: SyntheticMeasurement
  /** Hours before the seed the report was uploaded (and reviewed, when it was). */
  hoursAgo: { uploaded: number; reviewed?: number }
}

export const generatedNote = (m: SyntheticMeasurement) =>
  `${DEMO_MARK} Not a measurement: this curve was generated from the model's prediction at ${Math.round(m.modulusRatio * 100)} % of the nominal modulus, resampled at ${m.points} even steps, plus Gaussian noise of ${m.noiseFraction * 100} % of the largest force (fixed seed).`

export const DEMO_REPORTS: readonly DemoReport[] = [
  {
    entry: 'Power switch, field node shell S1',
    uploader: ENGINEER,
    reviewer: LIBRARIAN,
    reviewNote: 'Accepted: the curve keeps its shape and the fitted modulus is consistent with other PETG prints from this printer.',
    status: 'accepted',
    filePath: demoFileKey('power-switch-s1'),
    originalName: 'demo-s1-switch-stand-run-1.csv',
    printer: 'Bench printer 1, 0.4 mm nozzle',
    material: 'PETG, demo lot',
    lot: 'DEMO-24-07',
    orientation: 'flat, bending plane in the build plane',
    testSpeed: 10,
    measurement: { modulusRatio: 0.88, noiseFraction: 0.015, points: 121, seed: 0x15a1 },
    hoursAgo: { uploaded: 50, reviewed: 26 },
  },
  {
    entry: 'Battery door hinge, field node shell S1',
    uploader: ENGINEER,
    status: 'submitted',
    filePath: demoFileKey('battery-door-hinge-s1'),
    originalName: 'demo-s1-hinge-torque-run-1.csv',
    printer: 'Bench printer 1, 0.4 mm nozzle',
    material: 'PP, demo lot',
    lot: 'DEMO-24-09',
    orientation: 'flat, bending plane in the build plane',
    testSpeed: 30,
    measurement: { modulusRatio: 1.07, noiseFraction: 0.02, points: 91, seed: 0x15b2 },
    hoursAgo: { uploaded: 5 },
  },
]

export interface DemoConfiguration {
  owner: string
  entry: string
  name: string
  params: Record<string, number | string>
  window: Record<string, number> | null
  /** Shared by a link (a token is made on the first start). */
  shared: boolean
}

export const DEMO_CONFIGURATIONS: readonly DemoConfiguration[] = [
  {
    owner: ENGINEER,
    entry: 'Power switch, field node shell S1',
    name: 'S1 switch, firmer for winter gloves (demo)',
    params: { span: 60, apexHeight: 2.2, thickness: 0.75, depth: 6, postLength: 0, material: 'petg' },
    window: null,
    shared: false,
  },
  {
    owner: ENGINEER,
    entry: 'Tamper latch, gateway lid G2',
    name: 'G2 tamper latch, deeper beam (demo, shared)',
    params: { span: 45, apexHeight: 2.4, thickness: 0.6, depth: 5, postLength: 1.5, material: 'pa12' },
    window: null,
    shared: true,
  },
]
