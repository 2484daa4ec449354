// Unit-test setup: property tests run from a fixed seed so a CI run is repeatable; set
// FC_SEED to explore other seeds locally.
import fc from 'fast-check'

fc.configureGlobal({ seed: Number(process.env.FC_SEED ?? 20261202), numRuns: 200 })
