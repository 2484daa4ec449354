// invitations and password_resets: one-time link rows (only token hashes are stored).
import type { Knex } from 'knex'
import type { Role } from '#shared/types/auth'

const INVITE_COLUMNS = ['id', 'workshop_id', 'email', 'name', 'role', 'client_org_id', 'job_id', 'expires_at', 'accepted_at', 'created_at']

/** An invitations row as INVITE_COLUMNS read it (the token hash stays in the table). */
export interface InvitationRow {
  id: number
  workshop_id: number
  email: string
  name: string | null
  role: Role
  client_org_id: number | null
  job_id: number | null
  expires_at: Date
  accepted_at: Date | null
  created_at: Date
}

export const invitationsRepo = {
  async insert(db: Knex, row: { workshop_id: number; email: string; name?: string | null; role: Role; client_org_id?: number | null; job_id?: number | null; token_hash: string; invited_by: number; expires_at: Date }): Promise<InvitationRow> {
    const [created] = await db('invitations').insert(row).returning(INVITE_COLUMNS)
    return created
  },
  pending(db: Knex, workshopId: number): Promise<InvitationRow[]> {
    return db('invitations').select(INVITE_COLUMNS).where({ workshop_id: workshopId }).whereNull('accepted_at')
      .where('expires_at', '>', db.fn.now()).orderBy('created_at', 'desc')
  },
  /** An unexpired, unaccepted invitation by token hash, locked for acceptance when in a transaction. */
  openByTokenHash(db: Knex, tokenHash: string): Promise<InvitationRow | undefined> {
    return db('invitations').select(INVITE_COLUMNS).where({ token_hash: tokenHash }).whereNull('accepted_at')
      .where('expires_at', '>', db.fn.now()).first()
  },
  markAccepted(db: Knex, id: number, userId: number) {
    return db('invitations').where({ id }).whereNull('accepted_at').update({ accepted_at: db.fn.now(), accepted_user_id: userId, updated_at: db.fn.now() })
  },
}

export const resetsRepo = {
  insert(db: Knex, row: { workshop_id: number; user_id: number; token_hash: string; expires_at: Date }) {
    return db('password_resets').insert(row)
  },
  /** An unused, unexpired reset link of an enabled account, by token hash. */
  openByTokenHash(db: Knex, tokenHash: string): Promise<{ id: number; workshop_id: number; user_id: number } | undefined> {
    return db('password_resets as r').join('users as u', function () {
      this.on('u.id', 'r.user_id').andOn('u.workshop_id', 'r.workshop_id')
    })
      .select('r.id', 'r.workshop_id', 'r.user_id').where('r.token_hash', tokenHash).whereNull('r.used_at')
      .whereNull('u.disabled_at').where('r.expires_at', '>', db.fn.now()).first()
  },
  markUsed(db: Knex, id: number) {
    return db('password_resets').where({ id }).whereNull('used_at').update({ used_at: db.fn.now(), updated_at: db.fn.now() })
  },
  /**
   * Ends every open reset link of a user: they expire now (used_at stays empty, they were
   * never used). The number of links ended.
   */
  voidOpen(db: Knex, workshopId: number, userId: number) {
    return db('password_resets').where({ workshop_id: workshopId, user_id: userId }).whereNull('used_at')
      .where('expires_at', '>', db.fn.now()).update({ expires_at: db.fn.now(), updated_at: db.fn.now() })
  },
}
