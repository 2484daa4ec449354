// GET /api/ready: whether this instance can serve, for a proxy, a monitor or a person at the
// server. Public, so it carries counts and times only: no addresses, subjects or errors.
export interface BackgroundRunDto {
  job: string
  lastStartedAt: string
  lastFinishedAt: string | null
  /** null while the run is going on */
  ok: boolean | null
  /** what the last run did: mails sent, pours mailed about, rows removed */
  items: number
}

export interface ReadyDto {
  ready: boolean
  database: 'up' | 'down'
  /** this instance's worker of the background queue */
  backgroundWork: 'running' | 'starting'
  mail: { backlog: number; oldestSeconds: number | null } | null
  jobs: BackgroundRunDto[]
}
