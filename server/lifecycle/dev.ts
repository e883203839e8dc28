/**
 * `npm run dev`: the local database as in `npm start`, then the API under `tsx watch` (restarts
 * on change) and Vite's dev server with hot module replacement, proxying /api and /socket.io.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { REPO_ROOT } from '../app.ts';
import { openDatabase } from '../db/client.ts';
import { DEMO_PASSWORD, DEMO_PEOPLE, seedDemoOnce } from '../db/seed.ts';
import { bringUpDatabase, precheckEnv } from './localStack.ts';
import { startMailSink } from '../mail/sink.ts';
import { stopOnAnyExit } from './crashGuard.ts';

async function main(): Promise<void> {
  precheckEnv();
  const stack = await bringUpDatabase();
  stopOnAnyExit(() => stack.stop());
  const seedDb = openDatabase(stack.env.DATABASE_URL, { max: 2 });
  await seedDemoOnce(seedDb.db);
  const sink = stack.env.SMTP_URL ? null : await startMailSink(seedDb.db);

  const apiPort = String(process.env.API_PORT ?? 3000);
  const env = {
    ...process.env,
    DATABASE_URL: stack.env.DATABASE_URL,
    SESSION_SECRET: stack.env.SESSION_SECRET,
    PORT: apiPort,
    API_PORT: apiPort,
    NODE_ENV: 'development',
    ...(sink ? { SMTP_URL: sink.url } : {}),
  };
  const children: ChildProcess[] = [
    spawn(path.join(REPO_ROOT, 'node_modules/.bin/tsx'), ['watch', '--clear-screen=false', 'server/index.ts'], { cwd: REPO_ROOT, env, stdio: 'inherit' }),
    spawn(path.join(REPO_ROOT, 'node_modules/.bin/vite'), ['--host', '127.0.0.1'], { cwd: REPO_ROOT, env, stdio: 'inherit' }),
  ];
  console.log(`Dev servers starting: open the Vite URL printed below. Demo sign-in: ${DEMO_PEOPLE[0].email} / ${DEMO_PASSWORD}`);

  let stopping = false;
  const stop = () => {
    if (stopping) return;
    stopping = true;
    for (const child of children) child.kill('SIGTERM');
    Promise.all(children.map((c) => new Promise((r) => (c.exitCode !== null ? r(null) : c.once('exit', r))))).then(async () => {
      await sink?.close();
      await seedDb.close();
      stack.stop();
      process.exit(0);
    });
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
  for (const child of children) child.once('exit', () => stop());
}

main().catch((err) => {
  console.error((err as Error).message);
  process.exit(1);
});
