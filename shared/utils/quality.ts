// The lead's quality figures from the register: defect rate by mould, grade, caster
// and shop-temperature band, and predicted against actual demould time per grade. Pure: the
// route reads the demoulded pours of a period and hands them here.
import { calibrationFromPours } from './plaster-set'
import { POUR_MIX_MINUTES_DEFAULT } from './pour-timing'

export interface QualityPour {
  mould: string
  grade: string
  caster: string | null
  shopTempC: number | null
  result: 'sound' | 'defect'
  /** when mixing started (actual) */
  mixingAt: Date | null
  /** the plan's demould window opening and closing */
  demouldOpenAt: Date
  demouldCloseAt: Date | null
  demouldedAt: Date | null
  /** the model's minutes from the start of mixing to demould-ready at set factor 1, stored at pouring */
  predictedMinutes: number | null
}

export interface DefectRate { key: string; pours: number; defects: number; rate: number }
/** Per grade over the period: `count` attended demoulds behind `factor`, `excluded` early or late ones left out; minutes are the set part. */
export interface QualityGradeCalibration { grade: string; count: number; excluded: number; factor: number; predictedMinutes: number | null; actualMinutes: number | null }
export interface QualityFigures {
  pours: number
  defects: number
  byMould: DefectRate[]
  byGrade: DefectRate[]
  byCaster: DefectRate[]
  byTemperature: DefectRate[]
  calibration: QualityGradeCalibration[]
}

/**
 * Shop-temperature bands in °C, lower bound inclusive: five-degree steps around the usual
 * 15–25 °C workshop range (common practice), to group defect rates by the conditions casters
 * worked in. They make no claim about set time: the model's own tables (plaster-presets.ts)
 * are flat from 20 to 40 °C and slow the set only below 20 °C.
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
 * Per grade over the period, through the register's own rule (calibrationFromPours: attended
 * demoulds only, the set part of the model's stored prediction against the set part of the
 * actual time), over every pour of the period (lastN 10000) rather than the grade's last 20.
 */
function calibrationByGrade(pours: QualityPour[]): QualityGradeCalibration[] {
  const byGrade = new Map<string, QualityPour[]>()
  for (const p of pours) byGrade.set(p.grade, [...(byGrade.get(p.grade) ?? []), p])
  return [...byGrade.keys()].sort((a, b) => a.localeCompare(b)).map((grade) => {
    const ordered = byGrade.get(grade)!.sort((a, b) => (a.demouldedAt?.getTime() ?? 0) - (b.demouldedAt?.getTime() ?? 0))
    const { factor, count, excluded, samples } = calibrationFromPours(ordered.map(p => ({ ...p, mixMinutes: POUR_MIX_MINUTES_DEFAULT })), { lastN: 10000 })
    return { grade, count, excluded, factor, predictedMinutes: medianOf(samples.map(s => s.predictedMinutes)), actualMinutes: medianOf(samples.map(s => s.actualMinutes)) }
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
