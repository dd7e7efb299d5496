import type { BandMatrix } from './band'
import * as beam from './corotational-beam'
import * as codes from './frame-model'
import type { FrameModel } from './frame-model'

// Module-local copies of the constants used in the element loop: a loader that turns imports
// into property getters (tsx does) would otherwise call a getter at every use, a quarter of
// the assembly time on small frames.
const { createElementOutput, evaluateBeam } = beam
const ELEMENT_STRIDE = beam.ELEMENT_STRIDE
const CONTROL = codes.CONTROL
const SCATTER_GENERAL = codes.SCATTER_GENERAL
const SCATTER_KCC = codes.SCATTER_KCC
const SCATTER_KFC = codes.SCATTER_KFC

/** What one assembly returns besides the residual and the tangent. */
export interface AssemblyState {
  /** Internal force at the control dof (its reaction under displacement control). */
  reaction: number
  /** ∂reaction/∂control with the other unknowns held (the K_cc entry). */
  kcc: number
  /** Largest |axial| + |bending| strain over the elements. */
  maxStrain: number
}

const element = createElementOutput()
const target = new Int32Array(6)
const fT = new Float64Array(6)
const kT = new Float64Array(36)
const tBlock = new Float64Array(18) // per element end: 3×3 transformation slave → root

/** Moves every rigid-link slave with its root: u_s = u_m + (R(θ_m) − I)·d, θ_s = θ_m. */
export function updateSlaves(model: FrameModel, u: Float64Array): void {
  if (!model.hasSlaves) return
  const { root, offsetX, offsetY } = model
  for (let n = 0; n < model.nodeCount; n++) {
    const m = root[n]
    if (m === n) continue
    const th = u[3 * m + 2]
    const c = Math.cos(th), s = Math.sin(th)
    const dx = offsetX[n], dy = offsetY[n]
    u[3 * n] = u[3 * m] + c * dx - s * dy - dx
    u[3 * n + 1] = u[3 * m + 1] + s * dx + c * dy - dy
    u[3 * n + 2] = th
  }
}

/**
 * Assembles the internal-force residual on the unknowns (`residual`, zeroed here), and, when
 * `tangent` is given, the banded tangent of the unknowns and its coupling `kfc` to a
 * prescribed control dof. `u` holds all node displacements (slaves already updated).
 */
export function assemble(
  model: FrameModel, u: Float64Array, residual: Float64Array,
  tangent: BandMatrix | null, kfc: Float64Array | null, state: AssemblyState,
): void {
  const { connectivity, constants, equation, root } = model
  residual.fill(0)
  if (tangent) tangent.data.fill(0)
  if (kfc) kfc.fill(0)
  let reaction = 0, kcc = 0, maxStrain = 0
  const withTangent = tangent !== null
  const hb1 = tangent ? tangent.halfBandwidth + 1 : 0
  const band = tangent ? tangent.data : null
  const f = element.force, K = element.tangent

  for (let k = 0; k < model.elementCount; k++) {
    const a = connectivity[2 * k], b = connectivity[2 * k + 1]
    const strain = evaluateBeam(constants, ELEMENT_STRIDE * k,
      u[3 * a], u[3 * a + 1], u[3 * a + 2], u[3 * b], u[3 * b + 1], u[3 * b + 2], element, withTangent)
    if (strain > maxStrain) maxStrain = strain
    const e6 = 6 * k, e36 = 36 * k
    if (model.scatter[e36] !== SCATTER_GENERAL) {
      // fast path: precomputed equation numbers and band positions
      for (let i = 0; i < 6; i++) {
        const gi = model.elementEquation[e6 + i]
        if (gi >= 0) residual[gi] += f[i]
        else if (gi === CONTROL) reaction += f[i]
      }
      if (!withTangent) continue
      const scatter = model.scatter
      for (let i = 0; i < 36; i++) {
        const code = scatter[e36 + i]
        if (code >= 0) band![code] += K[i]
        else if (code <= SCATTER_KFC) kfc![SCATTER_KFC - code] += K[i]
        else if (code === SCATTER_KCC) kcc += K[i]
      }
      continue
    }
    let fe = f, ke = K
    const ra = root[a], rb = root[b]
    if (ra !== a || rb !== b) {
      transformToRoots(model, u, a, b, withTangent)
      fe = fT
      ke = kT
    }
    target[0] = 3 * ra; target[1] = 3 * ra + 1; target[2] = 3 * ra + 2
    target[3] = 3 * rb; target[4] = 3 * rb + 1; target[5] = 3 * rb + 2
    for (let i = 0; i < 6; i++) {
      const gi = equation[target[i]]
      if (gi >= 0) residual[gi] += fe[i]
      else if (gi === CONTROL) reaction += fe[i]
      if (!withTangent || gi === -1) continue
      for (let j = 0; j < 6; j++) {
        const gj = equation[target[j]]
        if (gj === -1) continue
        const v = ke[6 * i + j]
        if (gi >= 0) {
          if (gj >= gi) band![gi * hb1 + gj - gi] += v
          else if (gj === CONTROL) kfc![gi] += v
        } else if (gj === CONTROL) kcc += v
      }
    }
  }

  const { springDof, springStiffness } = model
  for (let k = 0; k < springDof.length; k++) {
    const g = springDof[k], ks = springStiffness[k]
    const q = equation[g]
    if (q >= 0) {
      residual[q] += ks * u[g]
      if (band) band[q * hb1] += ks
    } else if (q === CONTROL) {
      reaction += ks * u[g]
      kcc += ks
    }
  }
  state.reaction = reaction
  state.kcc = kcc
  state.maxStrain = maxStrain
}

/**
 * Carries an element's force and tangent from its end nodes to their roots:
 * f_root = Tᵀ f, K_root = Tᵀ K T, plus the term from the rotation of the link arm,
 * ∂²u_s/∂θ_m² · f_s, on the root's rotation.
 */
function transformToRoots(model: FrameModel, u: Float64Array, a: number, b: number, withTangent: boolean): void {
  const f = element.force, K = element.tangent
  const ends = [a, b]
  const geo = [0, 0]
  for (let e = 0; e < 2; e++) {
    const n = ends[e]
    const m = model.root[n]
    const t = 9 * e
    tBlock.fill(0, t, t + 9)
    tBlock[t] = 1; tBlock[t + 4] = 1; tBlock[t + 8] = 1
    if (m !== n) {
      const th = u[3 * m + 2]
      const c = Math.cos(th), s = Math.sin(th)
      const dx = model.offsetX[n], dy = model.offsetY[n]
      tBlock[t + 2] = -(s * dx + c * dy)
      tBlock[t + 5] = c * dx - s * dy
      geo[e] = -f[3 * e] * (c * dx - s * dy) - f[3 * e + 1] * (s * dx + c * dy)
    }
  }
  // f_root = Tᵀ f (block diagonal T)
  for (let e = 0; e < 2; e++) {
    const t = 9 * e
    for (let i = 0; i < 3; i++) {
      let sum = 0
      for (let r = 0; r < 3; r++) sum += tBlock[t + 3 * r + i] * f[3 * e + r]
      fT[3 * e + i] = sum
    }
  }
  if (!withTangent) return
  for (let i = 0; i < 6; i++) {
    const ei = i < 3 ? 0 : 1, li = i % 3
    for (let j = 0; j < 6; j++) {
      const ej = j < 3 ? 0 : 1, lj = j % 3
      let sum = 0
      for (let r = 0; r < 3; r++) {
        const tri = tBlock[9 * ei + 3 * r + li]
        if (tri === 0) continue
        for (let q = 0; q < 3; q++) sum += tri * K[6 * (3 * ei + r) + 3 * ej + q] * tBlock[9 * ej + 3 * q + lj]
      }
      kT[6 * i + j] = sum
    }
  }
  kT[6 * 2 + 2] += geo[0]
  kT[6 * 5 + 5] += geo[1]
}
