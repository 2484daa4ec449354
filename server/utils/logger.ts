// One structured logger per process (pino: JSON lines on stdout, which journald keeps under
// systemd). Nothing a person typed or a session carries is logged: request lines hold the
// method, the path with secret-looking query values masked, the status and the time taken —
// never headers or bodies — and the redact list below blanks the same things should an error
// object carry them. LOG_LEVEL picks the level (info by default).
import pino, { type Logger } from 'pino'

/** Keys whose values never reach the log, wherever pino meets them one or two levels down. */
export const REDACTED_KEYS = ['password', 'newPassword', 'currentPassword', 'pin', 'token', 'code', 'cookie', 'authorization', 'set-cookie', 'secret', 'sessionPassword']

const segment = (k: string) => /^[A-Za-z_$][\w$]*$/.test(k) ? k : `["${k}"]`
const under = (prefix: string, k: string) => segment(k).startsWith('[') ? `${prefix}${segment(k)}` : `${prefix}.${segment(k)}`
const redactPaths = REDACTED_KEYS.flatMap(k => [segment(k), under('*', k), under('*.*', k)])

let instance: Logger | undefined

export function useLogger(): Logger {
  instance ??= pino({
    level: process.env.LOG_LEVEL ?? 'info',
    base: { app: 'setline', pid: process.pid },
    redact: { paths: redactPaths, censor: '[redacted]' },
    timestamp: pino.stdTimeFunctions.isoTime,
  })
  return instance
}

const SECRET_PARAM = /token|code|pass|pin|secret|key|sig/i

/** The request path with the value of every secret-looking query parameter masked (reset and invitation links carry their token there). */
export function loggablePath(path: string): string {
  // a calendar feed's secret is the last segment of its path (services/calendar-feeds.ts)
  path = path.replace(/^\/api\/ics\/[^/?]+/, '/api/ics/[redacted]')
  const q = path.indexOf('?')
  if (q < 0) return path
  const params = new URLSearchParams(path.slice(q + 1))
  for (const name of [...params.keys()]) if (SECRET_PARAM.test(name)) params.set(name, '[redacted]')
  return `${path.slice(0, q)}?${params.toString()}`
}
