import { SolverError } from '../errors'
import { createBandMatrix, type BandMatrix } from './band'
import { ELEMENT_STRIDE } from './corotational-beam'
import { reverseCuthillMcKee } from './ordering'
import type { Dof, Frame } from './types'

const FIXED = -1
/** Equation marker of the driven degree of freedom under displacement control. */
export const CONTROL = -2

/** A frame compiled into flat arrays for assembly (no objects in the inner loop). */
export interface FrameModel {
  nodeCount: number
  elementCount: number
  /** Two node indices per element. */
  connectivity: Int32Array
  /** ELEMENT_STRIDE constants per element (see corotational-beam.ts). */
  constants: Float64Array
  /** Per node: the node whose dofs it follows (itself unless it is a rigid-link slave). */
  root: Int32Array
  /** Per node: initial offset from its root (mm); zero for non-slaves. */
  offsetX: Float64Array
  offsetY: Float64Array
  hasSlaves: boolean
  /** Per global dof (node*3 + dof): equation index, FIXED or CONTROL. */
  equation: Int32Array
  equationCount: number
  halfBandwidth: number
  springDof: Int32Array
  springStiffness: Float64Array
  /** Global dof index of the control degree of freedom. */
  control: number
  /** A force scale for convergence checks: max over elements of EI/L0², N. */
  forceScale: number
  /** Mean element length, mm: weighs rotations against translations in the arc-length constraint. */
  lengthScale: number
  /**
   * Per element without rigid-link ends: 36 scatter targets of its tangent (row-major):
   * ≥ 0 an index into the band storage, SCATTER_KFC − q for column q of K_fc, SCATTER_KCC,
   * or SCATTER_NONE. Elements touching a slave use the general path (scatter[36k] = SCATTER_GENERAL).
   */
  scatter: Int32Array
  /** Per element: equation of each of its 6 dofs (as in `equation`). */
  elementEquation: Int32Array
}

const SCATTER_NONE = -1
export const SCATTER_KCC = -2
export const SCATTER_GENERAL = -3
/** K_fc entries are encoded as SCATTER_KFC − q. */
export const SCATTER_KFC = -4

function fail(message: string, details: Record<string, unknown> = {}): never {
  throw new SolverError(`frame: ${message}`, details)
}

function checkDof(dof: number, where: string): asserts dof is Dof {
  if (dof !== 0 && dof !== 1 && dof !== 2) fail(`${where}: dof must be 0 (ux), 1 (uy) or 2 (rotation), got ${dof}`)
}

/**
 * Compiles a frame for a path request. `controlPrescribed` is true for displacement control
 * (the control dof leaves the unknowns) and false for arc-length (it is loaded by a force).
 */
export function compileFrame(
  frame: Frame,
  control: { node: number; dof: Dof },
  controlPrescribed: boolean,
  imperfection: Array<{ node: number; dx: number; dy: number }> = [],
): FrameModel {
  const nodeCount = frame.nodes.length
  const checkNode = (n: number, where: string) => {
    if (!Number.isInteger(n) || n < 0 || n >= nodeCount) fail(`${where} refers to node ${n}, which does not exist (${nodeCount} nodes)`)
  }
  const x = new Float64Array(nodeCount)
  const y = new Float64Array(nodeCount)
  frame.nodes.forEach((p, i) => {
    if (!Number.isFinite(p.x) || !Number.isFinite(p.y)) fail(`node ${i} has a non-finite position`)
    x[i] = p.x
    y[i] = p.y
  })
  for (const imp of imperfection) {
    checkNode(imp.node, 'imperfection')
    x[imp.node] += imp.dx
    y[imp.node] += imp.dy
  }

  // rigid links: every slave follows a root master (chains resolved)
  const master = new Int32Array(nodeCount).fill(-1)
  for (const link of frame.rigidLinks ?? []) {
    checkNode(link.master, 'rigid link master')
    checkNode(link.slave, 'rigid link slave')
    if (link.master === link.slave) fail(`rigid link joins node ${link.slave} to itself`)
    if (master[link.slave] >= 0) fail(`node ${link.slave} is the slave of two rigid links`)
    master[link.slave] = link.master
  }
  const root = new Int32Array(nodeCount)
  for (let i = 0; i < nodeCount; i++) {
    let r = i
    for (let hops = 0; master[r] >= 0; hops++) {
      if (hops > nodeCount) fail(`rigid links form a loop through node ${i}`)
      r = master[r]
    }
    root[i] = r
  }
  const offsetX = new Float64Array(nodeCount)
  const offsetY = new Float64Array(nodeCount)
  let hasSlaves = false
  for (let i = 0; i < nodeCount; i++) {
    if (root[i] !== i) {
      hasSlaves = true
      offsetX[i] = x[i] - x[root[i]]
      offsetY[i] = y[i] - y[root[i]]
    }
  }

  const elementCount = frame.elements.length
  if (elementCount === 0) fail('has no elements')
  const connectivity = new Int32Array(2 * elementCount)
  const constants = new Float64Array(ELEMENT_STRIDE * elementCount)
  let forceScale = 0
  let lengthSum = 0
  frame.elements.forEach((e, k) => {
    const [a, b] = e.nodes
    checkNode(a, `element ${k}`)
    checkNode(b, `element ${k}`)
    const s = e.section
    if (!(s.modulus > 0 && s.area > 0 && s.inertia > 0 && s.fibre >= 0)) fail(`element ${k} needs a positive modulus, area and inertia`)
    const dx = x[b] - x[a], dy = y[b] - y[a]
    // the same expression as the element uses for the current length, so the unloaded frame is exactly free of force
    const L0 = Math.sqrt(dx * dx + dy * dy)
    if (!(L0 > 0)) fail(`element ${k} has zero length (nodes ${a} and ${b} coincide)`)
    connectivity[2 * k] = a
    connectivity[2 * k + 1] = b
    const at = ELEMENT_STRIDE * k
    constants[at] = dx
    constants[at + 1] = dy
    constants[at + 2] = L0
    constants[at + 3] = s.modulus * s.area
    constants[at + 4] = s.modulus * s.inertia
    constants[at + 5] = s.fibre
    forceScale = Math.max(forceScale, (s.modulus * s.inertia) / (L0 * L0))
    lengthSum += L0
  })

  checkNode(control.node, 'control')
  checkDof(control.dof, 'control')
  if (root[control.node] !== control.node) fail(`the control node ${control.node} is a rigid-link slave; drive its master ${root[control.node]}`)
  const fixed = new Uint8Array(3 * nodeCount)
  for (const sup of frame.supports) {
    checkNode(sup.node, 'support')
    if (root[sup.node] !== sup.node) fail(`support on node ${sup.node}, a rigid-link slave; support its master instead`)
    for (const d of sup.dofs) {
      checkDof(d, `support on node ${sup.node}`)
      fixed[3 * sup.node + d] = 1
    }
  }
  const controlDof = 3 * control.node + control.dof
  if (fixed[controlDof]) fail(`the control dof (node ${control.node}, dof ${control.dof}) is also a support`)

  const springs = frame.springs ?? []
  const springDof = new Int32Array(springs.length)
  const springStiffness = new Float64Array(springs.length)
  springs.forEach((sp, k) => {
    checkNode(sp.node, `spring ${k}`)
    checkDof(sp.dof, `spring ${k}`)
    if (root[sp.node] !== sp.node) fail(`spring ${k} on node ${sp.node}, a rigid-link slave; attach it to its master`)
    if (!(sp.stiffness >= 0) || !Number.isFinite(sp.stiffness)) fail(`spring ${k} needs a finite stiffness of at least 0`)
    springDof[k] = 3 * sp.node + sp.dof
    springStiffness[k] = sp.stiffness
  })

  // number the equations node by node in reverse Cuthill–McKee order of the root nodes
  const edges: Array<[number, number]> = []
  for (let k = 0; k < elementCount; k++) edges.push([root[connectivity[2 * k]], root[connectivity[2 * k + 1]]])
  const used = new Uint8Array(nodeCount)
  for (const [a, b] of edges) { used[a] = 1; used[b] = 1 }
  used[control.node] = 1
  const order = reverseCuthillMcKee(nodeCount, edges, (v) => root[v] === v && used[v] === 1)
  const equation = new Int32Array(3 * nodeCount).fill(FIXED)
  let equationCount = 0
  for (const n of order) {
    for (let d = 0; d < 3; d++) {
      const g = 3 * n + d
      if (fixed[g]) continue
      equation[g] = g === controlDof && controlPrescribed ? CONTROL : equationCount++
    }
  }
  if (equationCount === 0) fail('has no free degrees of freedom')

  let halfBandwidth = 0
  for (let k = 0; k < elementCount; k++) {
    let lo = Infinity, hi = -Infinity
    for (let e = 0; e < 2; e++) {
      const n = root[connectivity[2 * k + e]]
      for (let d = 0; d < 3; d++) {
        const q = equation[3 * n + d]
        if (q >= 0) { lo = Math.min(lo, q); hi = Math.max(hi, q) }
      }
    }
    if (hi > lo) halfBandwidth = Math.max(halfBandwidth, hi - lo)
  }

  const scatter = new Int32Array(36 * elementCount)
  const elementEquation = new Int32Array(6 * elementCount)
  const hb1 = halfBandwidth + 1
  for (let k = 0; k < elementCount; k++) {
    const a = connectivity[2 * k], b = connectivity[2 * k + 1]
    for (let i = 0; i < 6; i++) elementEquation[6 * k + i] = equation[3 * root[i < 3 ? a : b] + (i % 3)]
    if (root[a] !== a || root[b] !== b) { scatter[36 * k] = SCATTER_GENERAL; continue }
    for (let i = 0; i < 6; i++) {
      const gi = elementEquation[6 * k + i]
      for (let j = 0; j < 6; j++) {
        const gj = elementEquation[6 * k + j]
        let code = SCATTER_NONE
        if (gi >= 0 && gj >= gi) code = gi * hb1 + gj - gi
        else if (gi >= 0 && gj === CONTROL) code = SCATTER_KFC - gi
        else if (gi === CONTROL && gj === CONTROL) code = SCATTER_KCC
        scatter[36 * k + 6 * i + j] = code
      }
    }
  }

  return {
    scatter, elementEquation,
    nodeCount, elementCount, connectivity, constants, root, offsetX, offsetY, hasSlaves,
    equation, equationCount, halfBandwidth, springDof, springStiffness, control: controlDof,
    forceScale, lengthScale: lengthSum / elementCount,
  }
}

export function createTangent(model: FrameModel): BandMatrix {
  return createBandMatrix(model.equationCount, model.halfBandwidth)
}
