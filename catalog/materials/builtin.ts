import type { Material } from './types'

// Moduli and Poisson's ratios: docs/references.md §8 (MDPI Processes 13(9):2733, 2025 citing bulk values for PLA,
// ABS, PETG; manufacturers' datasheets for PA12 by powder-bed fusion). Strain limits for
// printed parts are estimates (no handbook value); snap-fit limits follow the suppliers'
// guides as recalled (from memory, to be verified per printer and lot).
export const builtinMaterials: readonly Material[] = Object.freeze([
  {
    id: 'pla', name: 'PLA (FDM)', process: 'FDM', modulus: 3500, poissonRatio: 0.36, strainLimit: 0.012, density: 1.24,
    source: 'Modulus: MDPI Processes 13(9):2733 (2025), bulk value; strain limit 1–1.5 % for printed PLA is an estimate.',
    poissonRatioSource: 'Poisson\u2019s ratio 0.36: Farah, Anderson & Langer, Adv. Drug Deliv. Rev. 107 (2016) 367–392, table of PLA properties (from memory).',
  },
  {
    id: 'petg', name: 'PETG (FDM)', process: 'FDM', modulus: 2000, poissonRatio: 0.38, strainLimit: 0.02, density: 1.27,
    source: 'Modulus: MDPI Processes 13(9):2733 (2025), bulk value; strain limit ≈ 2 % for printed PETG is an estimate.',
    poissonRatioSource: 'Poisson\u2019s ratio 0.38: Mark (ed.), Polymer Data Handbook (Oxford, 1999), PET entry 0.37–0.44, lower end for the amorphous glycol copolymer (from memory).',
  },
  {
    id: 'abs', name: 'ABS (FDM)', process: 'FDM', modulus: 2100, poissonRatio: 0.35, strainLimit: 0.025, density: 1.04,
    source: 'Modulus: MDPI Processes 13(9):2733 (2025), bulk value; 2.5 % short-term strain from snap-fit design guides (from memory).',
    poissonRatioSource: 'Poisson\u2019s ratio 0.35: Mark (ed.), Physical Properties of Polymers Handbook (2nd ed., Springer, 2007), mechanical-properties table (from memory).',
  },
  {
    id: 'pa12', name: 'PA12 (powder-bed fusion)', process: 'SLS', modulus: 1800, poissonRatio: 0.39, strainLimit: 0.04, density: 1.01,
    source: 'Modulus 1.7–1.9 GPa: manufacturers\u2019 datasheets; 4 % strain limit is an estimate between PC and conditioned PA6 guide values (from memory).',
    poissonRatioSource: 'Poisson\u2019s ratio 0.39: Mark (ed.), Polymer Data Handbook (Oxford, 1999), nylon 12 entry (from memory).',
  },
  {
    id: 'pp', name: 'PP (FDM)', process: 'FDM', modulus: 1200, poissonRatio: 0.42, strainLimit: 0.06, density: 0.9,
    source: 'Modulus 1.0–1.5 GPa and 6 % permissible strain (snap-fit guides): from memory, to be verified.',
    poissonRatioSource: 'Poisson\u2019s ratio 0.42: Mark (ed.), Polymer Data Handbook (Oxford, 1999), isotactic polypropylene entry 0.40–0.45 (from memory).',
  },
])

export function findBuiltinMaterial(id: string): Material | undefined {
  return builtinMaterials.find((m) => m.id === id)
}
