/**
 * `npm start`: local PostgreSQL (unless DATABASE_URL is set) → migrations → demo seed (once) →
 * client build → serve API and client on one port. Ctrl-C stops the server and the cluster.
 */
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { REPO_ROOT } from '../app.ts';
import { openDatabase } from '../db/client.ts';
import { DEMO_PASSWORD, DEMO_PEOPLE, seedDemoOnce } from '../db/seed.ts';
import { exitOnSignals, startServer } from '../index.ts';
import { bringUpDatabase, precheckEnv } from './localStack.ts';

async function main(): Promise<void> {
  const started = Date.now();
  precheckEnv();
  const stack = await bringUpDatabase();
  let stopped = false;
  const stopAll = () => {
    if (!stopped) {
      stopped = true;
      stack.stop();
    }
  };
  try {
    const seedDb = openDatabase(stack.env.DATABASE_URL, { max: 2 });
    const seeded = await seedDemoOnce(seedDb.db);
    await seedDb.close();
    console.log(seeded === 'seeded' ? 'Demo data seeded.' : 'Demo data already present.');

    console.log('Building the client…');
    const build = spawnSync(path.join(REPO_ROOT, 'node_modules/.bin/vite'), ['build', '--logLevel', 'warn'], { cwd: REPO_ROOT, stdio: 'inherit' });
    if (build.status !== 0) throw new Error('The client build failed; see above.');

    const running = await startServer(stack.env);
    exitOnSignals(async () => {
      await running.close();
      stopAll();
    });
    const owner = DEMO_PEOPLE[0];
    console.log('');
    console.log(`Shockwright is running at ${running.url}  (ready in ${((Date.now() - started) / 1000).toFixed(1)} s)`);
    console.log(`Demo sign-in: ${owner.email} / ${DEMO_PASSWORD}  (team owner; colleagues ${DEMO_PEOPLE.slice(1).map((p) => p.email).join(', ')} use the same password)`);
    console.log('Press Ctrl-C to stop (PostgreSQL stops with it).');
  } catch (err) {
    stopAll();
    throw err;
  }
}

main().catch((err) => {
  console.error((err as Error).message);
  process.exit(1);
});
