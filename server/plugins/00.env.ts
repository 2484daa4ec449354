// Validates the configuration at boot, so a bad setting stops the server with a clear
// message instead of failing on the first request.
export default defineNitroPlugin(() => {
  const env = appEnv()
  const fakeProblem = mailFakeProblem(env)
  if (fakeProblem) throw new Error(fakeProblem)
  const relayProblem = mailRelayProblem(env)
  if (relayProblem) throw new Error(relayProblem)
  if (process.env.NODE_ENV === 'production' && (process.env.NUXT_SESSION_PASSWORD ?? '').length < 32) {
    throw new Error('NUXT_SESSION_PASSWORD must be set to at least 32 characters (npm start generates one into .data/)')
  }
})
