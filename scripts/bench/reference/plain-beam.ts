/**
 * A plain reference solver for the bistable pair, for the benchmark only: what a textbook
 * implementation looks like, timed beside Flexshelf's curve in the same run. Half of one
 * beam (clamped at the foot, guided at mid-span: ux = 0, θ = 0), 20 elements, the
 * corotational Euler–Bernoulli element with the linear local strain u/L0 of Crisfield
 * (Non-linear Finite Element Analysis of Solids and Structures, vol. 1, 1991, §7.3), mid-span
 * displacement prescribed in 100 equal steps to 2·apexHeight, full Newton–Raphson from the
 * last converged state (a step is halved when Newton fails), a banded Gaussian elimination
 * per iteration, the family's second-symmetric seed imperfection (1e-5 · thickness), peak
 * and valley taken from the 101 computed points. Nothing in the catalog uses it.
 */
export interface PlainGeometry {
  span: number
  apexHeight: number
  thickness: number
  depth: number
  modulus: number
}

export interface PlainCurve {
  displacement: Float64Array
  /** Module force (2 beams × 2 half beams), N. */
  force: Float64Array
  peakForce: number
  valleyForce: number
  iterations: number
}

export function solvePlainReference(g: PlainGeometry, elements = 20, steps = 100): PlainCurve {
  const nodes = elements + 1
  const ndof = 3 * nodes
  const half = g.span / 2
  const EA = g.modulus * g.thickness * g.depth
  const EI = (g.modulus * g.depth * g.thickness ** 3) / 12
  const x0 = new Float64Array(nodes), y0 = new Float64Array(nodes)
  for (let i = 0; i < nodes; i++) {
    const s = i / elements
    x0[i] = s * half
    y0[i] = (g.apexHeight / 2) * (1 - Math.cos(Math.PI * s)) + 1e-5 * g.thickness * (1 - Math.cos((4 * Math.PI * x0[i]) / g.span))
  }
  // the seeded shape is the stress-free one, as the family's imperfection is
  const mid = nodes - 1
  const control = 3 * mid + 1
  const fixed = new Set([0, 1, 2, 3 * mid, control, 3 * mid + 2])
  const free: number[] = []
  for (let d = 0; d < ndof; d++) if (!fixed.has(d)) free.push(d)
  const nf = free.length
  /** Free index of each global dof, −1 for a prescribed one. */
  const freeOf = new Int32Array(ndof).fill(-1)
  free.forEach((d, k) => { freeOf[d] = k })
  // nodes are numbered along the beam, so an element couples free dofs at most HALF_BAND apart:
  // the tangent is kept as a band (the usual storage of a textbook frame code)
  const HALF_BAND = 5
  const W = 2 * HALF_BAND + 1
  const u = new Float64Array(ndof)
  const fint = new Float64Array(ndof)
  const A = new Float64Array(nf * W)
  const b = new Float64Array(nf)
  const fe = new Float64Array(6)
  const ke = new Float64Array(36)
  const dofs = new Int32Array(6)
  const r = new Float64Array(6), z = new Float64Array(6), B1 = new Float64Array(6), B2 = new Float64Array(6)

  const assemble = () => {
    fint.fill(0)
    A.fill(0)
    for (let e = 0; e < elements; e++) {
      const i = e, j = e + 1
      const dx0 = x0[j] - x0[i], dy0 = y0[j] - y0[i]
      const L0 = Math.hypot(dx0, dy0)
      const dx = dx0 + u[3 * j] - u[3 * i], dy = dy0 + u[3 * j + 1] - u[3 * i + 1]
      const ln = Math.hypot(dx, dy)
      const c = dx / ln, s = dy / ln
      let alpha = Math.atan2(dy, dx) - Math.atan2(dy0, dx0)
      alpha = Math.atan2(Math.sin(alpha), Math.cos(alpha))
      const th1 = u[3 * i + 2] - alpha, th2 = u[3 * j + 2] - alpha
      const N = (EA * (ln - L0)) / L0
      const k = EI / L0
      const M1 = k * (4 * th1 + 2 * th2), M2 = k * (2 * th1 + 4 * th2)
      // Crisfield §7.3: δln = r·δp, δβ = z·δp/ln, θ = t − α, so δθ1 = δt1 − z·δp/ln
      r[0] = -c; r[1] = -s; r[2] = 0; r[3] = c; r[4] = s; r[5] = 0
      z[0] = s; z[1] = -c; z[2] = 0; z[3] = -s; z[4] = c; z[5] = 0
      for (let a = 0; a < 6; a++) { B1[a] = -z[a] / ln; B2[a] = -z[a] / ln }
      B1[2] += 1
      B2[5] += 1
      for (let a = 0; a < 6; a++) fe[a] = r[a] * N + B1[a] * M1 + B2[a] * M2
      for (let a = 0; a < 6; a++) {
        for (let q = 0; q < 6; q++) {
          ke[a * 6 + q] = (EA / L0) * r[a] * r[q]
            + k * (4 * B1[a] * B1[q] + 2 * B1[a] * B2[q] + 2 * B2[a] * B1[q] + 4 * B2[a] * B2[q])
            + (N / ln) * z[a] * z[q]
            + ((M1 + M2) / (ln * ln)) * (r[a] * z[q] + z[a] * r[q])
        }
      }
      dofs[0] = 3 * i; dofs[1] = 3 * i + 1; dofs[2] = 3 * i + 2; dofs[3] = 3 * j; dofs[4] = 3 * j + 1; dofs[5] = 3 * j + 2
      for (let a = 0; a < 6; a++) {
        fint[dofs[a]] += fe[a]
        const row = freeOf[dofs[a]]
        if (row < 0) continue
        for (let q = 0; q < 6; q++) {
          const col = freeOf[dofs[q]]
          if (col >= 0) A[row * W + col - row + HALF_BAND] += ke[a * 6 + q]
        }
      }
    }
  }

  /** Gaussian elimination on the band, A·x = b (x into b); no pivoting: the tangent is regular away from the limit points. */
  const solve = () => {
    for (let col = 0; col < nf; col++) {
      const piv = A[col * W + HALF_BAND]
      const last = Math.min(nf - 1, col + HALF_BAND)
      for (let row = col + 1; row <= last; row++) {
        const f = A[row * W + col - row + HALF_BAND] / piv
        if (f === 0) continue
        for (let q = col; q <= last; q++) A[row * W + q - row + HALF_BAND] -= f * A[col * W + q - col + HALF_BAND]
        b[row] -= f * b[col]
      }
    }
    for (let row = nf - 1; row >= 0; row--) {
      let v = b[row]
      const last = Math.min(nf - 1, row + HALF_BAND)
      for (let q = row + 1; q <= last; q++) v -= A[row * W + q - row + HALF_BAND] * b[q]
      b[row] = v / A[row * W + HALF_BAND]
    }
  }

  const forceScale = (48 * EI * g.apexHeight) / g.span ** 3
  let iterations = 0
  /** Newton at mid-span displacement −d; true when converged. */
  const newton = (d: number) => {
    u[control] = -d
    for (let it = 0; it < 30; it++) {
      assemble()
      let norm = 0
      for (let a = 0; a < nf; a++) norm = Math.max(norm, Math.abs(fint[free[a]]))
      iterations++
      if (norm < 1e-10 * forceScale) return true
      for (let a = 0; a < nf; a++) b[a] = -fint[free[a]]
      solve()
      for (let a = 0; a < nf; a++) u[free[a]] += b[a]
    }
    return false
  }

  const displacement = new Float64Array(steps + 1), force = new Float64Array(steps + 1)
  const saved = new Float64Array(ndof)
  let at = 0
  for (let step = 0; step <= steps; step++) {
    const target = (2 * g.apexHeight * step) / steps
    // march to the target from the last converged state, halving the increment while Newton
    // fails (a predictor extrapolating the last step jumps branches at the snap)
    let inc = target - at
    while (at < target - 1e-15) {
      saved.set(u)
      const next = Math.min(target, at + inc)
      if (newton(next)) { at = next; inc = Math.max(inc, target - at) }
      else {
        u.set(saved)
        inc /= 2
        if (inc < 1e-9 * g.apexHeight) throw new Error(`plain reference: no convergence at ${next}`)
      }
    }
    if (step === 0) newton(0)
    displacement[step] = target
    // reaction at the prescribed dof, module = 4 half beams; positive pushes
    force[step] = -4 * fint[control] + 0
  }
  let peak = -Infinity, valley = Infinity
  for (let k = 0; k <= steps; k++) { if (force[k] > peak) peak = force[k]; if (force[k] < valley) valley = force[k] }
  return { displacement, force, peakForce: peak, valleyForce: valley, iterations }
}
