export { checkPrintability, PRINTING_NOTES, PRINT_HEIGHT_KEYS } from './check'
export type { PrintabilityReport, PrintCheck, ParamFix, CheckLevel, PrintabilityOptions } from './check'
export {
  DEFAULT_PRINTER, LINE_WIDTH_PER_NOZZLE, MIN_PERIMETERS, PERIMETER_TOLERANCE, LAYER_TOLERANCE, MAX_LAYER_PER_NOZZLE,
  printerRules, printableWalls, printableHeights, nearestPrintableWall, nearestPrintableHeight, nearest, perimetersOf, MAX_PRINTABLE_VALUES,
} from './profile'
export type { PrinterRules } from './profile'
