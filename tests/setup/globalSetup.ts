import type { TestProject } from 'vitest/node';
import { startThrowawayCluster } from '../../server/lifecycle/throwawayCluster.ts';

declare module 'vitest' {
  export interface ProvidedContext {
    pgAdminUrl: string;
    pgTemplateDb: string;
  }
}

/**
 * Database for the API, realtime and browser suites. `npm test` starts one cluster for the whole
 * run and passes it in TEST_PG_ADMIN_URL; a bare `npx vitest` starts its own here.
 */
export default async function setup(project: TestProject) {
  if (process.env.TEST_PG_ADMIN_URL) {
    project.provide('pgAdminUrl', process.env.TEST_PG_ADMIN_URL);
    project.provide('pgTemplateDb', process.env.TEST_PG_TEMPLATE_DB ?? 'sw_template');
    return;
  }
  const cluster = await startThrowawayCluster();
  project.provide('pgAdminUrl', cluster.adminUrl);
  project.provide('pgTemplateDb', cluster.templateDb);
  return () => cluster.stop();
}
