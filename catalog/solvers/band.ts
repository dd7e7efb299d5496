/**
 * Symmetric banded matrix with an in-place LDLᵀ factorization (no pivoting).
 * Storage: row i keeps K[i][i..i+halfBandwidth] at data[i*(hb+1) + k]. The tangent of a
 * frame under displacement control is positive definite on a stable path and indefinite on
 * an unstable one; LDLᵀ handles both and counts the negative pivots (unstable directions).
 */
export interface BandMatrix {
  size: number
  halfBandwidth: number
  data: Float64Array
  /** Pivots d of the last factorization. */
  pivots: Float64Array
  /** Number of negative pivots of the last factorization. */
  negativePivots: number
}

export function createBandMatrix(size: number, halfBandwidth: number): BandMatrix {
  const hb = Math.min(halfBandwidth, Math.max(0, size - 1))
  return { size, halfBandwidth: hb, data: new Float64Array(size * (hb + 1)), pivots: new Float64Array(size), negativePivots: 0 }
}

/** Adds v to K[i][j] (either triangle; only the upper band is stored). */
export function bandAdd(m: BandMatrix, i: number, j: number, v: number): void {
  if (j < i) { const t = i; i = j; j = t }
  m.data[i * (m.halfBandwidth + 1) + (j - i)] += v
}

/**
 * Factors in place into Uᵀ D U (U unit upper, stored over the band). Returns the index of
 * the first pivot smaller than `singularTolerance` relative to the row's diagonal scale,
 * or -1 when the matrix is regular.
 */
export function bandFactor(m: BandMatrix, singularTolerance = 1e-13): number {
  const { size: n, halfBandwidth: hb, data: a, pivots } = m
  const w = hb + 1
  let negative = 0
  // a pivot is compared with its row's diagonal before elimination
  for (let j = 0; j < n; j++) pivots[j] = Math.abs(a[j * w])
  for (let j = 0; j < n; j++) {
    const rowJ = j * w
    const d = a[rowJ]
    const last = Math.min(n - 1, j + hb)
    if (!(Math.abs(d) > singularTolerance * pivots[j]) || !Number.isFinite(d)) {
      m.negativePivots = negative
      return j
    }
    pivots[j] = d
    if (d < 0) negative++
    const inv = 1 / d
    for (let i = j + 1; i <= last; i++) {
      const aji = a[rowJ + i - j]
      if (aji === 0) continue
      const l = aji * inv
      const rowI = i * w
      for (let k = i; k <= last; k++) a[rowI + k - i] -= l * a[rowJ + k - j]
      a[rowJ + i - j] = l
    }
  }
  m.negativePivots = negative
  return -1
}

/** Solves K x = b in place (b becomes x) with the factors from bandFactor. */
export function bandSolve(m: BandMatrix, b: Float64Array): void {
  const { size: n, halfBandwidth: hb, data: a, pivots } = m
  const w = hb + 1
  for (let j = 0; j < n; j++) {
    const bj = b[j]
    if (bj === 0) continue
    const rowJ = j * w
    const last = Math.min(n - 1, j + hb)
    for (let i = j + 1; i <= last; i++) b[i] -= a[rowJ + i - j] * bj
  }
  for (let j = 0; j < n; j++) b[j] /= pivots[j]
  for (let j = n - 1; j >= 0; j--) {
    const rowJ = j * w
    const last = Math.min(n - 1, j + hb)
    let s = b[j]
    for (let i = j + 1; i <= last; i++) s -= a[rowJ + i - j] * b[i]
    b[j] = s
  }
}
