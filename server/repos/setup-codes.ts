// The first-run set-up codes (db/migrations/20261204005000_setup_codes.ts). Not scoped to a
// workshop: they exist only while there is none.
import type { Knex } from 'knex'

export const setupCodesRepo = {
  async insert(db: Knex, codeHash: string, minutes: number) {
    await db('setup_codes').insert({ code_hash: codeHash, expires_at: db.raw('now() + make_interval(mins => ?)', [minutes]) })
  },
  /** Whether some code can still be used (one is printed again when none can). */
  async anyLive(db: Knex): Promise<boolean> {
    return Boolean(await db('setup_codes').first('id').whereNull('used_at').where('expires_at', '>', db.fn.now()))
  },
  async isLive(db: Knex, codeHash: string): Promise<boolean> {
    return Boolean(await db('setup_codes').first('id').where({ code_hash: codeHash }).whereNull('used_at').where('expires_at', '>', db.fn.now()))
  },
  /** The code's row, locked, when it is unused and unexpired; undefined otherwise. */
  async lockLive(db: Knex, codeHash: string): Promise<{ id: number } | undefined> {
    return db('setup_codes').first('id').where({ code_hash: codeHash }).whereNull('used_at')
      .where('expires_at', '>', db.fn.now()).forUpdate()
  },
  /** Spends every code: one workshop is set up, the others printed before are no longer needed. */
  async useAll(db: Knex) {
    await db('setup_codes').whereNull('used_at').update({ used_at: db.fn.now() })
  },
}
