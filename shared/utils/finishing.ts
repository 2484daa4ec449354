// Finishing rules shared by the server and the tablet: the dry-by time of a fettled piece (the
// plaster model's drying estimate over the cast's estimated area) and the weight a piece is
// handled at. Pure; the plaster arithmetic itself stays in plaster-drying.ts.
import { castExposedAreaM2, dryingEstimate } from './plaster-drying'
import type { FinishingPieceState } from './finishing-schemas'

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
export function finishingDryBy(input: { from: Date; wetMassKg: number; dryMassKg: number; cavityLitres: number; airTempC: number; relHumidityPct: number; thicknessMm?: number }) {
  const est = dryingEstimate({
    freeWaterKg: Math.max(0, input.wetMassKg - input.dryMassKg),
    // a fibrous shell dries through its own thickness (plaster-fibrous.ts dryingThicknessMm)
    exposedAreaM2: castExposedAreaM2({ volumeLitres: input.cavityLitres, thicknessMm: input.thicknessMm }),
    airTempC: input.airTempC,
    relHumidityPct: input.relHumidityPct,
    airSpeedMs: FINISHING_AIR_SPEED_MS,
  })
  const dryBy = Number.isFinite(est.hours) ? new Date(input.from.getTime() + est.hours * HOUR_MS) : null
  return { dryBy, hours: est.hours, warnings: est.warnings }
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
