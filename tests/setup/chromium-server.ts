// vitest globalSetup of the e2e project: one chromium for the whole browser run, started once
// and shared by every browser test file through its WebSocket endpoint. A file opens its own
// browser context (cookies, storage, offline switch and viewport of its own), which costs a few
// milliseconds where a chromium launch cost seconds on a loaded 2-core machine.
import type { TestProject } from 'vitest/node'
import { launchChromiumServer } from './browser'

export default async function setup(project: TestProject) {
  const server = await launchChromiumServer()
  project.provide('chromiumEndpoint', server.wsEndpoint())
  return async () => {
    await server.close()
  }
}
