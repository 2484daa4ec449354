// A chart axis's numbers in the house's number style (formatNumber), with as many decimals as
// the tick has (at most three). Chart.js's own tick labels go through Intl.NumberFormat, whose
// first call on a page loads ICU (shared/utils/workshop-format.ts); these do not.
import { formatNumber } from '#shared/utils/workshop-format'

export function tickLabel(value: string | number): string {
  if (typeof value !== 'number') return value
  const decimals = Math.min(3, String(value).split('.')[1]?.length ?? 0)
  return formatNumber(value, decimals)
}
