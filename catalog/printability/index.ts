export { checkPrintability, PRINT_HEIGHT_KEYS } from './check'
export type { PrintabilityReport, PrintCheck, ParamFix } from './check'
export {
  DEFAULT_PRINTER,     
  printerRules, printableWalls, printableHeights, nearestPrintableWall, nearestPrintableHeight, nearest,  MAX_PRINTABLE_VALUES,
} from './profile'
export type { PrinterRules } from './profile'
