import { defineConfig } from 'vitest/config'
import { defineVitestProject } from '@nuxt/test-utils/config'
import { fileURLToPath } from 'node:url'
import { realpathSync } from 'node:fs'
import Unimport from 'unimport/unplugin'
import { nitroAutoImports } from './tests/setup/server-imports'

// Projects, run by tests/setup/run.ts in order: unit (pure code in shared/), component
// (Vue components inside a Nuxt environment, tests/nuxt), services (server/repos and
// server/services imported directly, against a throwaway PostgreSQL, no build), api (the built server over
// HTTP against a throwaway PostgreSQL) and e2e (Debian's chromium through playwright-core
// against the same built server).
const alias = {
  '~~': fileURLToPath(new URL('./', import.meta.url)),
  '#shared': fileURLToPath(new URL('./shared', import.meta.url)),
}

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts'],
          environment: 'node',
          setupFiles: ['tests/setup/unit.ts'],
        },
      },
      // A git worktree may link node_modules to another checkout; vite serves files by their
      // real path, so allow that path (the same folder when node_modules is not a link).
      await defineVitestProject({
        server: { fs: { allow: [realpathSync(fileURLToPath(new URL('./node_modules', import.meta.url))), fileURLToPath(new URL('./', import.meta.url))] } },
        test: {
          name: 'component',
          include: ['tests/nuxt/**/*.test.ts'],
          environment: 'nuxt',
          environmentOptions: { nuxt: { domEnvironment: 'happy-dom' } },
        },
      }),
      {
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
          fileParallelism: false,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          globalSetup: ['tests/setup/server.ts'],
          setupFiles: ['tests/setup/per-file.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/setup/server.ts'],
          setupFiles: ['tests/setup/per-file.ts'],
          testTimeout: 60_000,
          hookTimeout: 60_000,
          fileParallelism: false,
          // pages answer after a server round trip and a re-render: a loaded 2-core runner needs
          // more than expect.poll's default second (a poll still ends as soon as it matches)
          expect: { poll: { timeout: 10_000 } },
        },
      },
    ],
  },
})
