/**
 * Physical bounds of every number a configuration, a saved configuration, a share link, a
 * search or a search job carries besides the family's own parameters. One place, so every
 * door refuses the same values with the same words; the web app's forms read them too.
 * Values outside them are not printers or tolerances anyone has, and the smallest ones made
 * the printability loops run for minutes (issue 11).
 */
export const PRINTER_BOUNDS = Object.freeze({
  /** Nozzle diameter, mm: 0.1 mm is the finest nozzle sold for FDM, 2 mm the coarsest (common practice). */
  nozzle: Object.freeze({ min: 0.1, max: 2 }),
  /** Layer height, mm: 0.02 mm is the finest a desktop printer's Z steps repeatably, 1 mm the thickest any nozzle lays (common practice). */
  layer: Object.freeze({ min: 0.02, max: 1 }),
})
export const TOLERANCE_BOUNDS = Object.freeze({
  /** ± wall thickness, mm (common practice: a tuned printer holds ±0.05 mm, a poor one ±0.3 mm). */
  thickness: Object.freeze({ min: 0, max: 1 }),
  /** ± modulus as a fraction: printed moduli spread ±20–30 % (docs/references.md §8); ±50 % is the most a band means anything at. */
  modulus: Object.freeze({ min: 0, max: 0.5 }),
})
/** Footprint sides, mm: a printer's bed holds 1 mm to 2 m (common practice). */
export const FOOTPRINT_BOUNDS = Object.freeze({ min: 1, max: 2000 })
