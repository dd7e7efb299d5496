/**
 * Every material carries its Poisson's ratio and where it comes from; the wide-beam correction
 * E/(1−ν²) reads it (issue 14; catalog/mechanics/wide-beam.ts). The built-in materials get the
 * catalog's values and sources; a material not built in (a calibrated one, named
 * "<base>-cal-r<report>") takes its base material's ratio, anything else 0.35, common practice for
 * unfilled thermoplastics, said in its source. Existing columns are left as they were. The values
 * are copied here, not imported, so that the migration keeps doing what it did when the catalog
 * changes. The column default (the same 0.35) lets a row written by older code still insert.
 */
import { DataTypes, QueryTypes, type QueryInterface } from 'sequelize'
import type { MigrationParams } from 'umzug'

type Context = MigrationParams<QueryInterface>

/** The built-in ratios as of this migration (docs/references.md §8, from memory). */
const BUILTIN_RATIOS: Record<string, { ratio: number; source: string }> = {
  pla: { ratio: 0.36, source: 'Poisson\u2019s ratio 0.36: Farah, Anderson & Langer, Adv. Drug Deliv. Rev. 107 (2016) 367–392, table of PLA properties (from memory).' },
  petg: { ratio: 0.38, source: 'Poisson\u2019s ratio 0.38: Mark (ed.), Polymer Data Handbook (Oxford, 1999), PET entry 0.37–0.44, lower end for the amorphous glycol copolymer (from memory).' },
  abs: { ratio: 0.35, source: 'Poisson\u2019s ratio 0.35: Mark (ed.), Physical Properties of Polymers Handbook (2nd ed., Springer, 2007), mechanical-properties table (from memory).' },
  pa12: { ratio: 0.39, source: 'Poisson\u2019s ratio 0.39: Mark (ed.), Polymer Data Handbook (Oxford, 1999), nylon 12 entry (from memory).' },
  pp: { ratio: 0.42, source: 'Poisson\u2019s ratio 0.42: Mark (ed.), Polymer Data Handbook (Oxford, 1999), isotactic polypropylene entry 0.40–0.45 (from memory).' },
}
const COMMON_PRACTICE_RATIO = 0.35
const COMMON_PRACTICE_SOURCE = `Poisson\u2019s ratio ${COMMON_PRACTICE_RATIO}: common practice for unfilled thermoplastics (set when the ratio was added).`

function ratioFor(id: string): { ratio: number; source: string } {
  const builtin = BUILTIN_RATIOS[id]
  if (builtin) return builtin
  const base = /^(.+)-cal-r\d+$/.exec(id)?.[1]
  if (base && BUILTIN_RATIOS[base]) return { ratio: BUILTIN_RATIOS[base].ratio, source: `Poisson\u2019s ratio from ${base}: ${BUILTIN_RATIOS[base].source}` }
  return { ratio: COMMON_PRACTICE_RATIO, source: COMMON_PRACTICE_SOURCE }
}

export async function up({ context: queryInterface }: Context): Promise<void> {
  await queryInterface.sequelize.transaction(async (transaction) => {
    await queryInterface.addColumn('Materials', 'poissonRatio', { type: DataTypes.FLOAT, allowNull: false, defaultValue: COMMON_PRACTICE_RATIO }, { transaction })
    await queryInterface.addColumn('Materials', 'poissonRatioSource', { type: DataTypes.TEXT, allowNull: false, defaultValue: COMMON_PRACTICE_SOURCE }, { transaction })
    const rows = await queryInterface.sequelize.query<{ id: string }>('SELECT "id" FROM "Materials"', { type: QueryTypes.SELECT, transaction })
    for (const row of rows) {
      const { ratio, source } = ratioFor(row.id)
      await queryInterface.bulkUpdate('Materials', { poissonRatio: ratio, poissonRatioSource: source }, { id: row.id }, { transaction })
    }
  })
}

export async function down({ context: queryInterface }: Context): Promise<void> {
  await queryInterface.sequelize.transaction(async (transaction) => {
    for (const column of ['poissonRatioSource', 'poissonRatio']) await queryInterface.removeColumn('Materials', column, { transaction })
  })
}
