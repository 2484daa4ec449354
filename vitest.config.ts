import { defineConfig } from 'vitest/config'
import { defineVitestProject } from '@nuxt/test-utils/config'
import { fileURLToPath } from 'node:url'
import { realpathSync } from 'node:fs'
import Unimport from 'unimport/unplugin'
import { nitroAutoImports } from './tests/setup/server-imports'
import LongestFirst from './tests/setup/sequencer'

// Projects, run by tests/setup/run.ts (which says what runs side by side): unit (pure code in
// shared/), component (Vue components inside a Nuxt environment, tests/nuxt), services
// (server/repos and server/services imported directly, against a throwaway PostgreSQL, no
// build), api (the built server over HTTP against a throwaway PostgreSQL) and e2e (Debian's
// chromium through playwright-core against the same built server).
// `--project X` on the command line (npm test passes one per step) loads only what X needs:
// the component project starts Nuxt to build its config, the services project reads the list
// of Nitro's auto-imports, and neither is worth doing for another project's run.
const asked = process.argv.flatMap((a, i, all) => a === '--project' ? [all[i + 1]] : a.startsWith('--project=') ? [a.slice(10)] : [])
const only = async <T>(name: string, make: () => T | Promise<T>) => !asked.length || asked.includes(name) ? [await make()] : []
// API and browser files each have their own database and server, so they run side by side;
// SETLINE_TEST_WORKERS sets how many at once (default 2 API files beside 2 browser files on 2
// cores, where most of a file's time is spent waiting on its server, its database or chromium;
// a third API file made sign-ins, each a deliberately slow scrypt hash, queue past the timeout);
// it is also how many servers the project's pool keeps started ahead (tests/setup/server-pool.ts).
const workers = (fallback: number) => Number(process.env.SETLINE_TEST_WORKERS) || fallback

const alias = {
  '~~': fileURLToPath(new URL('./', import.meta.url)),
  '#shared': fileURLToPath(new URL('./shared', import.meta.url)),
}

export default defineConfig({
  resolve: { alias },
  test: {
    // the files that run long for their size go first (tests/setup/sequencer.ts says why)
    sequence: { sequencer: LongestFirst },
    projects: [
      {
        resolve: { alias },
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts'],
          environment: 'node',
          setupFiles: ['tests/setup/unit.ts'],
          // the property tests run hundreds of cases: 5 s is too short on a loaded 2-core machine
          testTimeout: 30_000,
        },
      },
      // A git worktree may link node_modules to another checkout; vite serves files by their
      // real path, so allow that path (the same folder when node_modules is not a link).
      ...await only('component', () => defineVitestProject({
        server: { fs: { allow: [realpathSync(fileURLToPath(new URL('./node_modules', import.meta.url))), fileURLToPath(new URL('./', import.meta.url))] } },
        test: {
          name: 'component',
          include: ['tests/nuxt/**/*.test.ts'],
          environment: 'nuxt',
          // setting up the Nuxt app in each file outlasts the default 10 s on a loaded 2-core machine
          hookTimeout: 60_000,
          // a build folder of its own, so the production build and nuxt prepare (typecheck) can run beside it
          environmentOptions: { nuxt: { domEnvironment: 'happy-dom', overrides: { buildDir: fileURLToPath(new URL('./.nuxt-vitest', import.meta.url)) } } },
        },
      })),
      ...await only('services', () => ({
        resolve: { alias },
        // server code as Nitro compiles it: its auto-imports made explicit, in server/ only
        plugins: [Unimport.vite({ imports: nitroAutoImports(), include: [/[\\/]server[\\/].*\.ts$/], dts: false })],
        test: {
          name: 'services',
          include: ['tests/services/**/*.test.ts'],
          globalSetup: ['tests/setup/server.ts'],
          setupFiles: ['tests/setup/services.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
          maxWorkers: 2,
        },
      })),
      {
        resolve: { alias },
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          // files run one after another in a worker without a fresh process each (each still has
          // its own server and database): vitest, knex and playwright load once per worker
          isolate: false,
          globalSetup: ['tests/setup/server.ts'],
          setupFiles: ['tests/setup/per-file.ts'],
          // a test signs in several people, each a scrypt hash of a few hundred ms on a quiet core
          testTimeout: 60_000,
          hookTimeout: 60_000,
          maxWorkers: workers(2),
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          // files run one after another in a worker without a fresh process each (each still has
          // its own server and database): vitest, knex and playwright load once per worker
          isolate: false,
          globalSetup: ['tests/setup/server.ts', 'tests/setup/chromium-server.ts'],
          setupFiles: ['tests/setup/per-file.ts'],
          testTimeout: 60_000,
          hookTimeout: 60_000,
          maxWorkers: workers(2),
          // pages answer after a server round trip and a re-render: a loaded 2-core runner needs
          // more than expect.poll's default second (a poll still ends as soon as it matches)
          expect: { poll: { timeout: 10_000 } },
        },
      },
    ],
  },
})
