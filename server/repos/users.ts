// Every knex call for users. Sign-in looks users up by e-mail across workshops (an e-mail
// is one account); everything else is scoped to the caller's workshop.
import type { Knex } from 'knex'
import type { Role } from '#shared/types/auth'

export interface UserRow {
  id: number
  workshop_id: number
  email: string
  name: string
  role: Role
  client_org_id: number | null
  password_hash: string | null
  session_version: number
  disabled_at: Date | null
  version: number
}

const COLUMNS = ['id', 'workshop_id', 'email', 'name', 'role', 'client_org_id', 'password_hash', 'session_version', 'disabled_at', 'version']
const PUBLIC_COLUMNS = ['id', 'email', 'name', 'role', 'client_org_id', 'disabled_at', 'created_at']

/** The columns of a users row anyone but the person may see (PUBLIC_COLUMNS). */
export interface PublicUserRow {
  id: number
  email: string
  name: string
  role: Role
  client_org_id: number | null
  disabled_at: Date | null
  created_at: Date
}

/** Who a notification goes to: an enabled user with their notify_prefs. */
export interface RecipientRow { id: number; name: string; email: string; notify_prefs: unknown }

const RECIPIENT_COLUMNS = ['u.id', 'u.name', 'u.email', 'u.notify_prefs']

export const usersRepo = {
  /** The enabled members of a job (its clients), by id. */
  jobMemberRecipients(db: Knex, workshopId: number, jobId: number): Promise<RecipientRow[]> {
    return db('job_members as m').join('users as u', function () {
      this.on('u.id', 'm.user_id').andOn('u.workshop_id', 'm.workshop_id')
    }).where({ 'm.workshop_id': workshopId, 'm.job_id': jobId }).whereNull('u.disabled_at')
      .select(RECIPIENT_COLUMNS).orderBy('u.id')
  },
  /** The enabled client users of a client organisation, by id. */
  orgRecipients(db: Knex, workshopId: number, clientOrgId: number): Promise<RecipientRow[]> {
    return db('users as u').where({ 'u.workshop_id': workshopId, 'u.role': 'client', 'u.client_org_id': clientOrgId }).whereNull('u.disabled_at')
      .select(RECIPIENT_COLUMNS).orderBy('u.id')
  },
  /** The client organisation a client user belongs to, or null. */
  async clientOrgOf(db: Knex, workshopId: number, userId: number): Promise<number | null> {
    const row = await db('users').where({ workshop_id: workshopId, id: userId, role: 'client' }).first('client_org_id')
    return row?.client_org_id ?? null
  },
  /** The client users of an organisation (its portal members), by name. */
  orgMembers(db: Knex, workshopId: number, orgId: number): Promise<{ id: number; name: string; email: string; disabled_at: Date | null }[]> {
    return db('users').where({ workshop_id: workshopId, client_org_id: orgId, role: 'client' })
      .select('id', 'name', 'email', 'disabled_at').orderBy(['name', 'id'])
  },
  /** The workshop's enabled leads, by id. */
  leadRecipients(db: Knex, workshopId: number): Promise<RecipientRow[]> {
    return db('users as u').where({ 'u.workshop_id': workshopId, 'u.role': 'lead' }).whereNull('u.disabled_at')
      .select(RECIPIENT_COLUMNS).orderBy('u.id')
  },
  async byEmail(db: Knex, email: string): Promise<UserRow | undefined> {
    const row: UserRow | undefined = await db('users').whereRaw('lower(email) = lower(?)', [email]).first(COLUMNS)
    return row
  },
  async byId(db: Knex, workshopId: number, id: number): Promise<UserRow | undefined> {
    const row: UserRow | undefined = await db('users').where({ workshop_id: workshopId, id }).first(COLUMNS)
    return row
  },
  /** The workshop's people; has_pin says whether a tablet PIN is set (never the hash). */
  list(db: Knex, workshopId: number): Promise<(PublicUserRow & { has_pin: boolean })[]> {
    return db('users').select([...PUBLIC_COLUMNS, db.raw('pin_hash IS NOT NULL AS has_pin')])
      .where({ workshop_id: workshopId }).orderBy([{ column: 'role' }, { column: 'name' }])
  },
  async pinHash(db: Knex, workshopId: number, id: number): Promise<string | null> {
    const row = await db('users').where({ workshop_id: workshopId, id }).first('pin_hash')
    return row?.pin_hash ?? null
  },
  /** Sets (a hash) or clears (null) the tablet PIN; the number of rows changed. */
  setPin(db: Knex, workshopId: number, id: number, pinHash: string | null) {
    return db('users').where({ workshop_id: workshopId, id }).update({ pin_hash: pinHash, updated_at: db.fn.now() })
  },
  /** Who a shared tablet offers: enabled casters and finishers with a PIN, by name. */
  tabletPeople(db: Knex, workshopId: number, roles: readonly Role[]): Promise<{ id: number; name: string; role: Role }[]> {
    return db('users').select('id', 'name', 'role').where({ workshop_id: workshopId }).whereIn('role', roles)
      .whereNotNull('pin_hash').whereNull('disabled_at').orderBy('name')
  },
  async insert(db: Knex, row: { workshop_id: number; email: string; name: string; role: Role; client_org_id?: number | null; password_hash: string }) {
    const [created] = await db('users').insert(row).returning(COLUMNS)
    return created as UserRow
  },
  /** Sets a new password and ends every session the user had. */
  setPassword(db: Knex, workshopId: number, id: number, passwordHash: string) {
    return db('users').where({ workshop_id: workshopId, id })
      .update({ password_hash: passwordHash, session_version: db.raw('session_version + 1'), updated_at: db.fn.now() })
  },
  /** A caster's own days, hours (null: the workshop's) and mixes at once; true when the row is a caster of the workshop. */
  async setCasterHours(db: Knex, workshopId: number, id: number, h: { workingDays: number[] | null; shiftStart: string | null; shiftEnd: string | null; maxMixes: number }) {
    const n = await db('users').where({ workshop_id: workshopId, id, role: 'caster' })
      .update({ caster_days: h.workingDays, caster_start: h.shiftStart, caster_end: h.shiftEnd, max_mixes: h.maxMixes, updated_at: db.fn.now() })
    return n > 0
  },
  /** Disables or re-enables; both end the user's sessions. */
  async setDisabled(db: Knex, workshopId: number, id: number, disabled: boolean): Promise<PublicUserRow | undefined> {
    const [row] = await db('users').where({ workshop_id: workshopId, id })
      .update({
        disabled_at: disabled ? db.fn.now() : null,
        session_version: db.raw('session_version + 1'),
        version: db.raw('version + 1'),
        updated_at: db.fn.now(),
      }).returning(PUBLIC_COLUMNS)
    return row
  },
  async setRole(db: Knex, workshopId: number, id: number, role: Role): Promise<PublicUserRow | undefined> {
    const [row] = await db('users').where({ workshop_id: workshopId, id })
      .update({ role, session_version: db.raw('session_version + 1'), version: db.raw('version + 1'), updated_at: db.fn.now() })
      .returning(PUBLIC_COLUMNS)
    return row
  },
  async notifyPrefs(db: Knex, workshopId: number, id: number): Promise<unknown> {
    const row = await db('users').where({ workshop_id: workshopId, id }).first('notify_prefs')
    return row?.notify_prefs
  },
  /** Merges the given flags into notify_prefs (jsonb ||), leaving the other kinds as they were. */
  async mergeNotifyPrefs(db: Knex, workshopId: number, id: number, flags: Record<string, boolean>): Promise<unknown> {
    const [row] = await db('users').where({ workshop_id: workshopId, id })
      .update({ notify_prefs: db.raw('notify_prefs || ?::jsonb', [JSON.stringify(flags)]), updated_at: db.fn.now() })
      .returning('notify_prefs')
    return row?.notify_prefs
  },
}
