// Live events: a service emits one after its transaction commits, to the workshop's room
// (and, for what a client may see, to the job's room). Pages patch or refetch on them.
export interface LiveEvent<Row = unknown> {
  type: string
  id: number | string
  version?: number
  row?: Row
  /** Which session caused it, so the page that did the change can skip its own echo. */
  origin?: string
}

export const liveRooms = {
  workshop: (id: number) => `workshop:${id}`,
  job: (id: number) => `job:${id}`,
  /** the socket of whoever is switched in on a shared tablet, so revoking the tablet can drop it */
  tablet: (id: number) => `tablet:${id}`,
  /** every socket of one person, so a change to their rights reaches all of them at once */
  user: (id: number) => `user:${id}`,
  /** the sockets opened with one session (user_sessions.id), so signing out drops them */
  session: (id: number) => `session:${id}`,
}
