// Readiness, public: the database answers, this instance's background worker runs, the mail
// backlog and each background job's last run. 503 while not ready, so a proxy or a monitor can
// take the instance out; counts and times only, nothing about any workshop.
import type { ReadyDto } from '#shared/types/ready'
import { readiness } from '../queries/ready'

export default defineEventHandler(async (event): Promise<ReadyDto> => {
  const backgroundWork = currentBackgroundWork() ? 'running' : 'starting'
  try {
    const { mail, jobs } = await readiness(useDb())
    const ready = backgroundWork === 'running'
    if (!ready) setResponseStatus(event, 503)
    return { ready, database: 'up', backgroundWork, mail, jobs }
  }
  catch {
    setResponseStatus(event, 503)
    return { ready: false, database: 'down', backgroundWork, mail: null, jobs: [] }
  }
})
