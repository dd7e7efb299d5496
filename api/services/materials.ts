/** The curated materials; their numbers are what the catalog computes with. */
import type { Transaction } from 'sequelize'
import type { AppContext } from '../context'
import type { Material } from '../db'

export interface MaterialView {
  id: string
  name: string
  process: string
  modulus: number
  poissonRatio: number
  poissonRatioSource: string
  strainLimit: number
  density: number
  notes: string
  source: string
}

function toMaterialView(m: Material): MaterialView {
  return { id: m.id, name: m.name, process: m.process, modulus: m.modulus, poissonRatio: m.poissonRatio, poissonRatioSource: m.poissonRatioSource, strainLimit: m.strainLimit, density: m.density, notes: m.notes, source: m.source }
}

export async function listMaterials(context: AppContext, transaction?: Transaction): Promise<MaterialView[]> {
  const materials = await context.db.models.Material.findAll({ order: [['name', 'ASC']], transaction })
  return materials.map(toMaterialView)
}
