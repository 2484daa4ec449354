// The lead's quality figures from the register: defect rate by mould, grade, caster
// and shop-temperature band, and predicted against actual demould time per grade. Pure: the
// route reads the demoulded pours of a period and hands them here.
import { calibrationFactor } from './plaster-set'
import { demouldTiming } from './pour-status'

export interface QualityPour {
  mould: string
  grade: string
  caster: string | null
  shopTempC: number | null
  result: 'sound' | 'defect'
  /** when mixing started (actual) */
  mixingAt: Date | null
  /** the plan's demould window opening */
  demouldOpenAt: Date
  /** the window's close; a demould after it was late-attended */
  demouldCloseAt: Date
  demouldedAt: Date | null
}

export interface DefectRate { key: string; pours: number; defects: number; rate: number }
export interface GradeCalibration { grade: string; count: number; factor: number; predictedMinutes: number | null; actualMinutes: number | null }
export interface QualityFigures {
  pours: number
  defects: number
  byMould: DefectRate[]
  byGrade: DefectRate[]
  byCaster: DefectRate[]
  byTemperature: DefectRate[]
  calibration: GradeCalibration[]
}

/**
 * Shop-temperature bands in °C, lower bound inclusive. Five-degree steps around the usual
 * 15–25 °C workshop range, where set time changes noticeably per step (common practice).
 */
export const TEMPERATURE_BANDS: { key: string; below: number }[] = [
  { key: '< 10 °C', below: 10 },
  { key: '10–15 °C', below: 15 },
  { key: '15–20 °C', below: 20 },
  { key: '20–25 °C', below: 25 },
  { key: '≥ 25 °C', below: Infinity },
]
export const NOT_RECORDED = 'not recorded'

export function temperatureBand(c: number | null): string {
  if (c === null || !Number.isFinite(c)) return NOT_RECORDED
  return TEMPERATURE_BANDS.find(b => c < b.below)!.key
}

/** Defect rate per key, in `order` when given (bands), otherwise by key. */
function ratesBy(pours: QualityPour[], keyOf: (p: QualityPour) => string, order?: string[]): DefectRate[] {
  const groups = new Map<string, { pours: number; defects: number }>()
  for (const p of pours) {
    const g = groups.get(keyOf(p)) ?? { pours: 0, defects: 0 }
    g.pours++
    if (p.result === 'defect') g.defects++
    groups.set(keyOf(p), g)
  }
  const keys = order ? order.filter(k => groups.has(k)) : [...groups.keys()].sort((a, b) => a.localeCompare(b))
  return keys.map(key => ({ key, ...groups.get(key)!, rate: groups.get(key)!.defects / groups.get(key)!.pours }))
}

function medianOf(values: number[]): number | null {
  if (!values.length) return null
  const s = [...values].sort((a, b) => a - b)
  const mid = s.length >> 1
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2
}

/**
 * Per grade: predicted = plan's demould opening − mixing start, actual = demoulded − mixing
 * start, the same samples the register's calibration uses: demoulds inside the window only (an
 * early one was taken out before the set said so, a late one when someone came by; neither
 * measures the set time). The factor is calibrationFactor's median ratio over
 * every sample of the period (lastN 10000), so it agrees with the grade page's factor.
 */
function calibrationByGrade(pours: QualityPour[]): GradeCalibration[] {
  const byGrade = new Map<string, { predictedMinutes: number; actualMinutes: number }[]>()
  for (const p of pours) {
    if (!p.mixingAt || !p.demouldedAt || demouldTiming(p, p.demouldedAt) !== 'in_window') continue
    const sample = {
      predictedMinutes: (p.demouldOpenAt.getTime() - p.mixingAt.getTime()) / 60_000,
      actualMinutes: (p.demouldedAt.getTime() - p.mixingAt.getTime()) / 60_000,
    }
    byGrade.set(p.grade, [...(byGrade.get(p.grade) ?? []), sample])
  }
  return [...byGrade.keys()].sort((a, b) => a.localeCompare(b)).map((grade) => {
    const samples = byGrade.get(grade)!.filter(s => s.predictedMinutes > 0 && s.actualMinutes > 0)
    const { factor, count } = calibrationFactor(samples, { lastN: 10000 })
    return { grade, count, factor, predictedMinutes: medianOf(samples.map(s => s.predictedMinutes)), actualMinutes: medianOf(samples.map(s => s.actualMinutes)) }
  })
}

export function qualityFigures(pours: QualityPour[]): QualityFigures {
  return {
    pours: pours.length,
    defects: pours.filter(p => p.result === 'defect').length,
    byMould: ratesBy(pours, p => p.mould),
    byGrade: ratesBy(pours, p => p.grade),
    byCaster: ratesBy(pours, p => p.caster ?? 'no caster'),
    byTemperature: ratesBy(pours, p => temperatureBand(p.shopTempC), [...TEMPERATURE_BANDS.map(b => b.key), NOT_RECORDED]),
    calibration: calibrationByGrade(pours),
  }
}
