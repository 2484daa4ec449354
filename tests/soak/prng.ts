// The soak's seeded randomness: mulberry32, a small 32-bit generator (Tommy Ettinger's public
// domain mulberry32, the common choice for reproducible test schedules), so one seed replays
// the same shop, the same faults at the same points of the work and the same choices.
export interface Prng {
  /** a float in [0, 1) */
  next(): number
  /** an integer in [min, max] */
  int(min: number, max: number): number
  /** true with probability p */
  chance(p: number): boolean
  pick<T>(xs: readonly T[]): T
}

export function prng(seed: number): Prng {
  let a = seed >>> 0
  const next = () => {
    a = (a + 0x6D2B79F5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
  return {
    next,
    int: (min, max) => min + Math.floor(next() * (max - min + 1)),
    chance: p => next() < p,
    pick: xs => xs[Math.floor(next() * xs.length)]!,
  }
}

/** The seed from SOAK_SEED or a fresh one (printed by the runner so a failing run can be replayed). */
export function soakSeed(fromEnv = process.env.SOAK_SEED): number {
  if (fromEnv && /^\d+$/.test(fromEnv)) return Number(fromEnv) >>> 0
  return Math.floor(Math.random() * 2 ** 31)
}
