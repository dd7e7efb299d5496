/**
 * Two-mode closed form of the centrally clamped cosine beam pair: Qiu, Lang & Slocum,
 * "A curved-beam bistable mechanism", J. Microelectromechanical Systems 13(2):137–146, 2004.
 * Normalised per beam: Δ = d/h, f = F·l³/(E·I·h), Q = h/t. The shuttle suppresses the
 * antisymmetric mode 2, so the pair follows mode 1 (f1) until it meets the mode-3 line (f3)
 * at Δa = 1 − √(1 − 16/(3Q²)), runs along f3 to Δb = 1 + √(1 − 16/(3Q²)) and returns to f1.
 * Valid for rigidly clamped ends and slender, shallow beams.
 */
const PI4 = Math.PI ** 4

/** Mode-1 curve: f1 = 2π⁴Δ + (3/2)π⁴Q²Δ(1 − Δ)(2 − Δ) (Qiu et al. 2004, eq. for f1). */
export function modeOneForce(q: number, d: number): number {
  return 2 * PI4 * d + 1.5 * PI4 * q * q * d * (1 - d) * (2 - d)
}

/** Mode-3 line: f3 = 8π⁴ − 6π⁴Δ (N1 = 2π, N3 = 4π). */
function modeThreeForce(d: number): number {
  return 8 * PI4 - 6 * PI4 * d
}

/** ∫₀^Δ f1 dΔ. */
function modeOneWork(q: number, d: number): number {
  return PI4 * d * d + 1.5 * PI4 * q * q * (d * d - d ** 3 + d ** 4 / 4)
}

function modeThreeWork(d: number): number {
  return 8 * PI4 * d - 3 * PI4 * d * d
}

/** Critical ratio for bistability of the pair, Q = √(16/3) (Qiu et al. 2004). */
export const CRITICAL_Q = Math.sqrt(16 / 3)

/** Where the path runs along the mode-3 line, or null when Q is below the critical ratio. */
function modeThreeRange(q: number): [number, number] | null {
  const disc = 1 - 16 / (3 * q * q)
  if (disc < 0) return null
  const s = Math.sqrt(disc)
  return [1 - s, 1 + s]
}

/** The normalised force of the pair's path at Δ. */
export function closedFormForce(q: number, d: number): number {
  const range = modeThreeRange(q)
  return range && d > range[0] && d < range[1] ? modeThreeForce(d) : modeOneForce(q, d)
}

/** ∫₀^Δ f dΔ along the path. */
function closedFormWork(q: number, d: number): number {
  const range = modeThreeRange(q)
  if (!range || d <= range[0]) return modeOneWork(q, d)
  const [a, b] = range
  const w = modeOneWork(q, a) + modeThreeWork(Math.min(d, b)) - modeThreeWork(a)
  return d <= b ? w : w + modeOneWork(q, d) - modeOneWork(q, b)
}

/**
 * Largest strain at Δ from the mode shapes w = A1(1 − cos 2πx/l) + A3(1 − cos 4πx/l)
 * (derived here from the same two-mode model): the axial force sets the end shortening,
 * P·l/(EA) = (π²/l)(A1₀² − A1² − 4A3²), with P = 16π²EI/l² on the mode-3 line; bending
 * strain (t/2)·|Δκ| is largest at the clamps, |Δκ| = (4π²/l²)(d/2 + 4|A3|).
 * Returns strain·l²/(t·h) so that it scales with t·h/l² (plus an axial part ∝ t²/l² = 1/(Q·…)).
 */
export function closedFormStrain(q: number, d: number, h: number, t: number, l: number): number {
  const a10 = h / 2, a1 = (h * (1 - d)) / 2
  const range = modeThreeRange(q)
  let a3 = 0
  let axial: number
  if (range && d > range[0] && d < range[1]) {
    a3 = Math.sqrt(Math.max(0, (a10 * a10 - a1 * a1 - (4 / 3) * t * t) / 4))
    axial = ((4 / 3) * Math.PI ** 2 * t * t) / (l * l)
  } else {
    axial = (Math.PI ** 2 * (a10 * a10 - a1 * a1)) / (l * l)
  }
  const bending = (t / 2) * ((4 * Math.PI ** 2) / (l * l)) * ((d * h) / 2 + 4 * a3)
  return Math.abs(axial) + bending
}

export interface ClosedFormMetrics {
  /** Normalised per-beam forces f and positions Δ. */
  peak: number
  peakAt: number
  valley: number
  valleyAt: number
  /** Zero crossings (null when monostable). */
  unstableAt: number | null
  secondAt: number | null
  /** ∫ f dΔ to the unstable position, and back from the second one. */
  workIn: number | null
  barrier: number | null
}

/** Mode-1 local extrema: Δ = 1 ∓ √(1/3 − 4/(9Q²)) (from df1/dΔ = 0). */
function modeOneTurns(q: number): [number, number] | null {
  const disc = 1 / 3 - 4 / (9 * q * q)
  if (disc <= 0) return null
  const s = Math.sqrt(disc)
  return [1 - s, 1 + s]
}

/** Zero of f on the path in (lo, hi) where it changes sign, by the analytic roots. */
function zeros(q: number): { unstable: number; second: number } | null {
  const disc1 = 0.25 - 4 / (3 * q * q)
  if (disc1 < 0) return null
  const r1 = 1.5 - Math.sqrt(disc1), r2 = 1.5 + Math.sqrt(disc1)
  const range = modeThreeRange(q)
  // the unstable zero is on f3 (Δ = 4/3) when that lies on the mode-3 stretch, else on f1
  const unstable = range && 4 / 3 > range[0] && 4 / 3 < range[1] ? 4 / 3 : r1
  return { unstable, second: r2 }
}

export function closedFormMetrics(q: number): ClosedFormMetrics {
  const range = modeThreeRange(q)
  const turns = modeOneTurns(q)
  let peakAt: number, valleyAt: number
  if (range) {
    peakAt = turns && turns[0] < range[0] ? turns[0] : range[0]
    valleyAt = turns && turns[1] > range[1] ? turns[1] : range[1]
  } else if (turns) {
    peakAt = turns[0]
    valleyAt = turns[1]
  } else {
    peakAt = 2
    valleyAt = 2
  }
  const peak = closedFormForce(q, peakAt), valley = closedFormForce(q, valleyAt)
  const z = valley < 0 ? zeros(q) : null
  return {
    peak, peakAt, valley, valleyAt,
    unstableAt: z ? z.unstable : null,
    secondAt: z ? z.second : null,
    workIn: z ? closedFormWork(q, z.unstable) : null,
    barrier: z ? closedFormWork(q, z.unstable) - closedFormWork(q, z.second) : null,
  }
}
