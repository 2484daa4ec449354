// Every knex call for user_sessions: the server's record of each signed-in session. The
// sealed cookie carries a random id; only its SHA-256 is stored (token_hash), so a copy of
// this table cannot be turned into a session.
import type { Knex } from 'knex'
import type { UserRow } from './users'

/** The user row and, when the session is still live, its record's id and end (else null). */
export type SessionUserRow = Omit<UserRow, 'password_hash'> & { session_id: number | null; session_expires_at: Date | null }

const USER_COLUMNS = ['u.id', 'u.workshop_id', 'u.email', 'u.name', 'u.role', 'u.client_org_id', 'u.session_version', 'u.disabled_at', 'u.version']

/** Ended or expired records stay this long (for someone looking into a sign-out), then go. */
const KEEP_ENDED = '1 day'

export const userSessionsRepo = {
  /** Records a new session that lasts `maxAgeS` seconds by the database's clock; its id. */
  async start(db: Knex, row: { workshop_id: number; user_id: number; token_hash: string; tablet_id: number | null }, maxAgeS: number): Promise<number> {
    const [created] = await db('user_sessions')
      .insert({ ...row, expires_at: db.raw('now() + make_interval(secs => ?)', [maxAgeS]) })
      .returning('id')
    return Number(created.id)
  },
  /**
   * The users of requests and whether their sessions are live, in one indexed query (this runs
   * for every request; server/utils/session-checks.ts sends the requests of one turn of the
   * event loop together): each (workshop, user, token) key's user row joined with the record
   * that is not ended, not expired and belongs to this very user and workshop. Answers in the
   * order asked; undefined where no such user is.
   */
  async usersOfSessions(db: Knex, keys: readonly { workshopId: number; userId: number; tokenHash: string }[]): Promise<(SessionUserRow | undefined)[]> {
    const r = await db.raw(`SELECT k.i, ${USER_COLUMNS.join(', ')}, s.id AS session_id, s.expires_at AS session_expires_at
      FROM unnest(?::bigint[], ?::bigint[], ?::text[]) WITH ORDINALITY AS k(workshop_id, user_id, token_hash, i)
      JOIN users u ON u.workshop_id = k.workshop_id AND u.id = k.user_id
      LEFT JOIN user_sessions s ON s.user_id = u.id AND s.workshop_id = u.workshop_id AND s.token_hash = k.token_hash
        AND s.ended_at IS NULL AND s.expires_at > now()`,
    [keys.map(k => k.workshopId), keys.map(k => k.userId), keys.map(k => k.tokenHash)])
    const byIndex = new Map<number, SessionUserRow>()
    for (const { i, ...row } of r.rows as (SessionUserRow & { i: number | string })[]) byIndex.set(Number(i), row)
    return keys.map((_, n) => byIndex.get(n + 1))
  },
  /** Ends one session by its cookie id; the ended record (undefined when none was live). */
  async end(db: Knex, tokenHash: string): Promise<{ id: number; user_id: number } | undefined> {
    const [row] = await db('user_sessions').where({ token_hash: tokenHash }).whereNull('ended_at')
      .update({ ended_at: db.fn.now() }).returning(['id', 'user_id'])
    return row
  },
  /** Ends every live session of a person (a new password, disabled, another role). */
  endForUser(db: Knex, workshopId: number, userId: number) {
    return db('user_sessions').where({ workshop_id: workshopId, user_id: userId }).whereNull('ended_at')
      .update({ ended_at: db.fn.now() })
  },
  /** Ends the sessions begun with a PIN on a tablet a lead revoked. */
  endForTablet(db: Knex, workshopId: number, tabletId: number) {
    return db('user_sessions').where({ workshop_id: workshopId, tablet_id: tabletId }).whereNull('ended_at')
      .update({ ended_at: db.fn.now() })
  },
  /** Drops a person's records that ended or expired more than a day ago. */
  pruneForUser(db: Knex, workshopId: number, userId: number) {
    return db('user_sessions').where({ workshop_id: workshopId, user_id: userId })
      .where(q => q.where('ended_at', '<', db.raw(`now() - interval '${KEEP_ENDED}'`))
        .orWhere('expires_at', '<', db.raw(`now() - interval '${KEEP_ENDED}'`)))
      .del()
  },
}
