/** A curve as two equally long arrays (displacement mm or rotation deg; force N or moment N·mm). */
export interface SampledCurve {
  displacement: readonly number[]
  force: readonly number[]
}
