// Finishing rules shared by the server and the tablet: the dry-by time of a fettled piece (the
// plaster model's drying estimate over the cast's estimated area) and the weight a piece is
// handled at. Pure; the plaster arithmetic itself stays in plaster-drying.ts.
import { castExposedAreaM2, constantWeightReachedAt, dryingEstimate, fallingRateFromWeighings, fallingRateNote } from './plaster-drying'
import type { FinishingPieceState } from './finishing-steps'

/**
 * Air speed over casts in a drying room with air moving, m/s: 0.3, a gentle draught from a
 * fan (common practice, no source; still indoor air is nearer 0.1 m/s and dries slower).
 */
export const FINISHING_AIR_SPEED_MS = 0.3

/**
 * Above this a piece is marked for a two-person lift or a lifting aid: 25 kg, the guideline
 * figure for a lift close to the body at waist height in HSE INDG143 "Manual handling at
 * work" (the figure falls to 16 kg for women and lower for reaching, twisting or lifting
 * overhead). A filter, not a safe limit: local rules decide.
 */
export const FINISHING_TEAM_LIFT_KG = 25

const HOUR_MS = 3_600_000

/**
 * When a piece put to dry at `from` should be dry: its free water (wet less dry mass) over the
 * constant-rate evaporation from both faces of the cast (castExposedAreaM2 of the mould's
 * cavity), times the falling-rate factor (dryingEstimate). `dryBy` is null when the air is
 * saturated (the cast will not dry). Warnings come from the estimate and the 49 °C guard.
 */
export function finishingDryBy(input: { from: Date; wetMassKg: number; dryMassKg: number; cavityLitres: number; airTempC: number; relHumidityPct: number; thicknessMm?: number; fallingRateFactor?: number }) {
  const est = dryingEstimate({
    freeWaterKg: Math.max(0, input.wetMassKg - input.dryMassKg),
    // a fibrous shell dries through its own thickness (plaster-fibrous.ts dryingThicknessMm)
    exposedAreaM2: castExposedAreaM2({ volumeLitres: input.cavityLitres, thicknessMm: input.thicknessMm }),
    airTempC: input.airTempC,
    relHumidityPct: input.relHumidityPct,
    airSpeedMs: FINISHING_AIR_SPEED_MS,
    fallingRateFactor: input.fallingRateFactor,
  })
  const dryBy = Number.isFinite(est.hours) ? new Date(input.from.getTime() + est.hours * HOUR_MS) : null
  return { dryBy, hours: est.hours, warnings: est.warnings }
}

/** How many of the shop's latest drying spells the falling-rate fit reads. */
export const FINISHING_FALLING_RATE_SPELLS = 50

/**
 * The shop's falling-rate factor from its drying spells: per spell, the hours from "put to dry"
 * to the first weighing shown at constant weight (constantWeightReachedAt: it was as dry as the
 * room makes it by then, so this errs long by up to the gap between weighings) ÷ the estimate's
 * hours at factor 1; their median through fallingRateFromWeighings, which keeps the default (1)
 * until enough pieces stand behind it. Spells that never reached constant weight, or whose
 * estimate gave no date (saturated air), say nothing and are left out.
 */
export function finishingFallingRate(spells: { fettledAt: Date; estimatedHours: number | null; weighings: { kg: number; at: Date }[] }[]) {
  const pieces = spells.flatMap((s) => {
    if (s.estimatedHours === null || !(s.estimatedHours > 0)) return []
    const reached = constantWeightReachedAt(s.weighings)
    return reached ? [{ estimatedHours: s.estimatedHours, actualHours: (reached.getTime() - s.fettledAt.getTime()) / HOUR_MS }] : []
  })
  const fit = fallingRateFromWeighings(pieces)
  return { ...fit, note: fallingRateNote(fit) }
}

const WET_STATES: readonly FinishingPieceState[] = ['to_fettle', 'repair', 'drying']

/**
 * The weight to lift a piece at, kg: its last weighing when there is one; else the wet mass
 * while it may still hold its water (to fettle, in repair, drying), the computed dry mass once
 * it has been passed as dry. Errs heavy, which is the safe side for handling.
 */
export function finishingHandlingKg(p: { state: FinishingPieceState; wetMassKg: number; dryMassKg: number; lastWeighedKg: number | null }) {
  if (p.lastWeighedKg !== null) return p.lastWeighedKg
  return WET_STATES.includes(p.state) ? p.wetMassKg : p.dryMassKg
}
