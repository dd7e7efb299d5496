/**
 * Snap-through metrics of a force–displacement curve pushed from 0 to 2·apexHeight.
 * Monostable curves get a continuous extension (zero crossings merged at the valley, no
 * barrier) so that tables of these numbers interpolate smoothly across the bistability limit.
 */
export interface SnapMetrics {
  peakForce: number
  peakAt: number
  valleyForce: number
  valleyAt: number
  /** Where the force falls through zero; the valley position when it never does. */
  unstableAt: number
  /** Where the force rises back through zero; the valley position when it never falls below. */
  secondAt: number
  /** Work to the unstable position (to the valley when monostable), N·mm. */
  energyIn: number
  /** Work to push back from the second position over the unstable one, N·mm (0 when monostable). */
  energyBarrier: number
  bistable: boolean
}

function crossing(x: number[], f: number[], i: number): number {
  return x[i - 1] + ((0 - f[i - 1]) * (x[i] - x[i - 1])) / (f[i] - f[i - 1])
}

/** Trapezoidal work ∫ f dx from position `from` to position `to` (inside the curve). */
export function work(x: number[], f: number[], from: number, to: number): number {
  let w = 0
  for (let i = 1; i < x.length; i++) {
    const a = Math.max(from, x[i - 1]), b = Math.min(to, x[i])
    if (b <= a) continue
    const slope = (f[i] - f[i - 1]) / (x[i] - x[i - 1])
    const fa = f[i - 1] + slope * (a - x[i - 1]), fb = f[i - 1] + slope * (b - x[i - 1])
    w += 0.5 * (fa + fb) * (b - a)
  }
  return w
}

export function snapMetrics(x: number[], f: number[]): SnapMetrics {
  const n = x.length
  // the peak is the first local maximum (the largest force on the way in)
  let peak = -1
  for (let i = 1; i < n - 1; i++) if (f[i] >= f[i - 1] && f[i] > f[i + 1]) { peak = i; break }
  if (peak < 0) {
    // no snap at all: the force only rises
    const last = n - 1
    return { peakForce: f[last], peakAt: x[last], valleyForce: f[last], valleyAt: x[last], unstableAt: x[last], secondAt: x[last], energyIn: work(x, f, x[0], x[last]), energyBarrier: 0, bistable: false }
  }
  let valley = peak
  for (let i = peak + 1; i < n; i++) if (f[i] < f[valley]) valley = i
  let unstableAt = x[valley], secondAt = x[valley]
  let bistable = false
  if (f[valley] < 0) {
    for (let i = peak + 1; i <= valley; i++) if (f[i] <= 0 && f[i - 1] > 0) { unstableAt = crossing(x, f, i); break }
    for (let i = valley + 1; i < n; i++) if (f[i] >= 0 && f[i - 1] < 0) { secondAt = crossing(x, f, i); bistable = true; break }
    if (!bistable) secondAt = x[n - 1]
  }
  const energyIn = work(x, f, x[0], unstableAt)
  const energyBarrier = bistable ? -work(x, f, unstableAt, secondAt) : 0
  return { peakForce: f[peak], peakAt: x[peak], valleyForce: f[valley], valleyAt: x[valley], unstableAt, secondAt, energyIn, energyBarrier, bistable }
}

/**
 * The family's reported metrics from the snap metrics of a curve (shared by the nonlinear-fe
 * and closed-form evaluations and the table's validation, so all three report alike).
 */
export function reportedMetrics(m: SnapMetrics, maxStrain: number, strainLimit: number): Record<string, number | boolean | null> {
  return {
    peakForce: m.peakForce,
    valleyForce: m.valleyForce,
    unstablePosition: m.valleyForce < 0 ? m.unstableAt : null,
    secondStablePosition: m.bistable ? m.secondAt : null,
    energyIn: m.valleyForce < 0 ? m.energyIn : null,
    energyBarrier: m.bistable ? m.energyBarrier : null,
    bistable: m.valleyForce < 0,
    maxStrain,
    strainLimit,
    safetyFactor: strainLimit / maxStrain,
  }
}
