/** Browser tests: build the client, start the real server with the demo, hand its address and lead token to the tests. */
import type { TestProject } from 'vitest/node';
import { buildClient, startServer } from './harness.ts';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    leadToken: string;
    databaseUrl: string;
  }
}

export default async function setup(project: TestProject) {
  await buildClient();
  const server = await startServer();
  project.provide('baseUrl', server.url);
  project.provide('leadToken', server.token);
  project.provide('databaseUrl', server.databaseUrl);
  return () => server.stop();
}
