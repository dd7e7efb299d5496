/**
 * The engineering core's one entrance, used by the API, the CLI, the web app and scripts.
 * Pure: no I/O, deterministic for the same input.
 */
export { families, findFamily, getFamily, registerFamily, UnknownFamilyError } from './registry'
export { evaluate, evaluateFamily, buildGeometry, clearSolidCache } from './evaluate'
export type { EvaluateOptions } from './evaluate'
export * from './schema'
export * from './errors'
export { builtinMaterials, findBuiltinMaterial } from './materials'
export type { Material } from './materials'
export { nearlyEqual, roundTo } from './numeric'

export { serializeStl } from './geometry/stl'
export { buildPartFile, serialize3mf, serializeDxf, serializeProfileSvg, profileOf, indexedMesh, PART_FORMATS } from './files'
export type { PartFormat, PartMetadata, Profile, IndexedMesh } from './files'

// Search and the configure screen's checks (force window, tolerance band, printability).
export { searchShelf, searchShelfSync, SearchCancelledError, createShelfIndex, DEMO_SHELF, windowCacheKey } from './search'
export type { Shelf, ShelfEntry, SearchOptions, SearchProgress, SearchResult, SearchAnswer, SearchMaterial } from './search'
export { parseWindow, judge, judgeWithBand } from './window'
export type { ForceWindow, Judgement, MetricBand, PrinterProfile, ManufacturingTolerance } from './window'
export { toleranceBand, DEFAULT_TOLERANCE, DEFAULT_TOLERANCE_NOTE } from './tolerance'
export type { ToleranceBand } from './tolerance'
export { checkPrintability, DEFAULT_PRINTER, printerRules } from './printability'
export type { PrintabilityReport, PrintCheck, ParamFix } from './printability'

// Measured curves against predictions: fitted effective modulus, feature differences, calibration figures.
export { fitModulus, compareToPrediction, calibrationSummary } from './calibration'
export type { ModulusFit, CurveComparison, FeatureDifference, CalibrationGroup, SampledCurve } from './calibration'
