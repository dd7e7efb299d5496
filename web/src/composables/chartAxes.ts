import type { Palette } from '@/theme/tokens'
import { fontFamily } from '@/theme/tokens'
import { formatNumber } from './metrics'

/** An axis title with its unit in brackets, as every Flexshelf plot writes it. */
export function axisName(axis: { label: string; unit: string }): string {
  return axis.unit ? `${axis.label} (${axis.unit})` : axis.label
}

/** The look shared by the value axes of every curve plot (echarts axis options). */
export function valueAxisStyle(p: Palette) {
  return {
    nameLocation: 'middle',
    nameTextStyle: { color: p.inkMuted, fontFamily, fontSize: 12 },
    axisLine: { lineStyle: { color: p.line } },
    axisTick: { show: false },
    axisLabel: { color: p.inkMuted, fontFamily, fontSize: 12, formatter: (v: number) => formatNumber(v) },
    splitLine: { lineStyle: { color: p.line, opacity: 0.55 } },
  }
}
