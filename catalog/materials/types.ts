/** A material as the engineering core sees it. Moduli in MPa, strains as fractions (0.02 = 2 %). */
export interface Material {
  id: string
  name: string
  /** How parts are made: 'FDM', 'SLS', 'moulded'. */
  process: string
  /** Young's modulus E in MPa. */
  modulus: number
  /** Poisson's ratio ν (the wide-beam correction E/(1−ν²) reads it). */
  poissonRatio: number
  /** Permissible strain for a flexure or one-off snap, as a fraction. */
  strainLimit: number
  /** Density in g/cm³. */
  density: number
  /** Where the modulus and strain limit come from. */
  source: string
  /** Where Poisson's ratio comes from. */
  poissonRatioSource: string
}
