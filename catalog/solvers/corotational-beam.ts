/**
 * Planar corotational Euler–Bernoulli beam element (Crisfield, Non-linear Finite Element
 * Analysis of Solids and Structures, vol. 1, 1991, §7.3) with the shallow-arch local strain
 * of Battini & Pacoste (Comput. Methods Appl. Mech. Engrg. 191:1755–1789, 2002):
 *   ε = u/L0 + (2θ1² − θ1θ2 + 2θ2²)/30,
 * which brings the axial-force–bending coupling inside each element, so that buckling and
 * snap-through converge with few elements. Rigid-body motion is removed exactly by the
 * rotating chord; rotations relative to the chord stay small, rotations in space need not.
 */

/** Per-element constants, packed: dx0, dy0, L0, EA, EI, fibre. */
export const ELEMENT_STRIDE = 6

/** Scratch output of one element evaluation. */
export interface ElementOutput {
  /** Internal force, global dofs (u1, v1, θ1, u2, v2, θ2). */
  force: Float64Array
  /** Tangent stiffness, 6×6 row-major. */
  tangent: Float64Array
}

export function createElementOutput(): ElementOutput {
  return { force: new Float64Array(6), tangent: new Float64Array(36) }
}

const b1 = new Float64Array(6)
const b2 = new Float64Array(6)
const ru = new Float64Array(6)
const zh = new Float64Array(6)

/**
 * Evaluates the element at displacements (u1, v1, t1, u2, v2, t2) of its end nodes.
 * Returns the largest |axial strain| + |curvature|·fibre at its two ends (curvature is
 * linear along a Hermite element, so the ends bound it).
 */
export function evaluateBeam(
  c: Float64Array, at: number,
  u1: number, v1: number, t1: number, u2: number, v2: number, t2: number,
  out: ElementOutput, withTangent: boolean,
): number {
  const dx0 = c[at], dy0 = c[at + 1], L0 = c[at + 2], EA = c[at + 3], EI = c[at + 4], fibre = c[at + 5]
  const dx = dx0 + u2 - u1
  const dy = dy0 + v2 - v1
  const ln = Math.sqrt(dx * dx + dy * dy)
  const cs = dx / ln, sn = dy / ln
  // chord rotation from the initial chord direction, robust for any angle
  const c0 = dx0 / L0, s0 = dy0 / L0
  const alpha = Math.atan2(c0 * sn - s0 * cs, c0 * cs + s0 * sn)
  const th1 = t1 - alpha
  const th2 = t2 - alpha
  // extension computed without cancellation
  const ext = (ln * ln - L0 * L0) / (ln + L0)
  const g1 = (4 * th1 - th2) / 30
  const g2 = (4 * th2 - th1) / 30
  const eps = ext / L0 + (2 * th1 * th1 - th1 * th2 + 2 * th2 * th2) / 30
  const N = EA * eps
  const k = EI / L0
  const M1 = k * (4 * th1 + 2 * th2) + N * L0 * g1
  const M2 = k * (2 * th1 + 4 * th2) + N * L0 * g2

  // r = ∂ln/∂p, z/ln = ∂α/∂p
  const rx = cs, ry = sn
  const zx = sn / ln, zy = -cs / ln
  const f = out.force
  const msum = M1 + M2
  f[0] = -N * rx - msum * zx
  f[1] = -N * ry - msum * zy
  f[2] = M1
  f[3] = N * rx + msum * zx
  f[4] = N * ry + msum * zy
  f[5] = M2

  if (withTangent) {
    // B rows: δln = r·δp, δθ1 = δt1 − z·δp/ln, δθ2 = δt2 − z·δp/ln
    const r0 = -rx, r1 = -ry, r3 = rx, r4 = ry
    const z0 = zx, z1 = zy, z3 = -zx, z4 = -zy
    b1[0] = -z0; b1[1] = -z1; b1[2] = 1; b1[3] = -z3; b1[4] = -z4; b1[5] = 0
    b2[0] = -z0; b2[1] = -z1; b2[2] = 0; b2[3] = -z3; b2[4] = -z4; b2[5] = 1
    ru[0] = r0; ru[1] = r1; ru[2] = 0; ru[3] = r3; ru[4] = r4; ru[5] = 0
    // local tangent (u, θ1, θ2)
    const kuu = EA / L0
    const ku1 = EA * g1, ku2 = EA * g2
    const k11 = 4 * k + EA * L0 * g1 * g1 + (4 * N * L0) / 30
    const k22 = 4 * k + EA * L0 * g2 * g2 + (4 * N * L0) / 30
    const k12 = 2 * k + EA * L0 * g1 * g2 - (N * L0) / 30
    const K = out.tangent
    // geometric part: (N/ln) ẑẑᵀ + ((M1+M2)/ln²)(r ẑᵀ + ẑ rᵀ), ẑ = z·ln (unit)
    zh[0] = z0 * ln; zh[1] = z1 * ln; zh[2] = 0; zh[3] = z3 * ln; zh[4] = z4 * ln; zh[5] = 0
    const gN = N / ln
    const gM = msum / (ln * ln)
    for (let i = 0; i < 6; i++) {
      const ri = ru[i], ai = b1[i], bi = b2[i], zi = zh[i]
      const p = kuu * ri + ku1 * ai + ku2 * bi
      const q = ku1 * ri + k11 * ai + k12 * bi
      const s = ku2 * ri + k12 * ai + k22 * bi
      for (let j = i; j < 6; j++) {
        const v = p * ru[j] + q * b1[j] + s * b2[j] + gN * zi * zh[j] + gM * (ri * zh[j] + zi * ru[j])
        K[i * 6 + j] = v
        K[j * 6 + i] = v
      }
    }
  }
  const kappa = Math.max(Math.abs(4 * th1 + 2 * th2), Math.abs(2 * th1 + 4 * th2)) / L0
  return Math.abs(eps) + kappa * fibre
}
