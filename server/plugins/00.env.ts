// Validates the configuration at boot, so a bad setting stops the server with a clear
// message instead of failing on the first request.
// A port already taken (another Setline, or anything else on PORT) ends the process too. Node
// reports a failed listen as an 'error' event on the server (Node.js docs, net, server.listen():
// "EADDRINUSE"), which Nitro's node-server entry does not listen for, so it reaches Nitro's
// trap for uncaught exceptions, which only logs: the process then ran on, its background work
// and mail fake started, serving nobody.
// While this listener is the only one (from this plugin until Nitro installs its trap), an
// error is a failed start, and it ends the process as Node would without a listener: a listener
// that returned would keep a half-started server running with exit code 0.
function exitOnFailedStart(err: NodeJS.ErrnoException) {
  if (err?.syscall === 'listen') {
    console.error(`Setline could not listen: ${err.message}. Is another server already using this port? Set PORT to a free one.`)
    process.exit(1)
  }
  if (process.listenerCount('uncaughtException') === 1) {
    console.error(err)
    process.exit(1)
  }
}

export default defineNitroPlugin(() => {
  process.on('uncaughtException', exitOnFailedStart)
  const env = appEnv()
  const fakeProblem = mailFakeProblem(env)
  if (fakeProblem) throw new Error(fakeProblem)
  const relayProblem = mailRelayProblem(env)
  if (relayProblem) throw new Error(relayProblem)
  if (process.env.NODE_ENV === 'production' && (process.env.NUXT_SESSION_PASSWORD ?? '').length < 32) {
    throw new Error('NUXT_SESSION_PASSWORD must be set to at least 32 characters (npm start generates one into .data/)')
  }
})
