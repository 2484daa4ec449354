// Stops or starts the soak's own PostgreSQL in a child process (`tsx tests/soak/pg-ctl.ts stop
// '<target json>'`): pg_ctl runs synchronously in db/local, and the simulator's tablets must keep
// retrying while the database is away rather than freeze with it.
import { downCluster, upCluster, type DbTarget } from '../../db/local/cluster'

const [what, json] = process.argv.slice(2)
const target = JSON.parse(json ?? '{}') as DbTarget
if (what === 'stop') downCluster(target)
else if (what === 'start') upCluster(target)
else throw new Error(`pg-ctl: stop or start, not ${what}`)
