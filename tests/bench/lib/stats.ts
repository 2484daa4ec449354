// Small helpers the benchmark scripts share: percentiles and number formatting.

/** The p-th percentile (nearest rank) of the samples. */
export function percentile(xs: number[], p: number): number {
  if (!xs.length) return NaN
  const s = [...xs].sort((a, b) => a - b)
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil((p / 100) * s.length) - 1))]!
}

export function median(xs: number[]): number {
  return percentile(xs, 50)
}

export const ms = (v: number) => `${v.toFixed(v < 10 ? 1 : 0)} ms`
export const mb = (kb: number) => `${(kb / 1024).toFixed(0)} MB`
