/**
 * `npm start`: local PostgreSQL (unless DATABASE_URL is set) → migrations → demo seed (once) →
 * client build → serve API and client on one port. Ctrl-C stops the server and the cluster.
 */
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { REPO_ROOT } from '../app.ts';
import { openDatabase } from '../db/client.ts';
import { DEMO_PASSWORD, DEMO_PEOPLE, seedDemoOnce } from '../db/seed.ts';
import { exitOnSignals, keepRunningOnStrayRejections, startServer } from '../index.ts';
import { stopOnAnyExit } from './crashGuard.ts';
import { bringUpDatabase, precheckEnv } from './localStack.ts';
import { startMailSink, type MailSink } from '../mail/sink.ts';
import { parseEnv } from '../env.ts';

async function main(): Promise<void> {
  const started = Date.now();
  precheckEnv();
  const stack = await bringUpDatabase();
  stopOnAnyExit(() => stack.stop());
  keepRunningOnStrayRejections();
  let stopped = false;
  let sink: MailSink | null = null;
  const sinkDb = openDatabase(stack.env.DATABASE_URL, { max: 2 });
  const stopAll = async () => {
    if (stopped) return;
    stopped = true;
    await sink?.close();
    await sinkDb.close();
    stack.stop();
  };
  try {
    const seeded = await seedDemoOnce(sinkDb.db);
    console.log(seeded === 'seeded' ? 'Demo data seeded.' : 'Demo data already present.');

    let env = stack.env;
    if (!env.SMTP_URL) {
      // No mail server configured: a local sink keeps every message in the database, readable
      // on the development mailbox page.
      sink = await startMailSink(sinkDb.db, { port: Number(process.env.SMTP_SINK_PORT ?? 0) });
      env = parseEnv({ ...process.env, DATABASE_URL: env.DATABASE_URL, SESSION_SECRET: env.SESSION_SECRET, SMTP_URL: sink.url });
      console.log(`Mail sink listening on ${sink.url}; each person reads the mail sent to them on the Mailbox page (/dev/mailbox).`);
      if (env.MAILBOX_OPERATOR.length === 0) {
        console.log('  To read every message there (sign-up links of addresses without an account, say), set MAILBOX_OPERATOR=<your e-mail>.');
      }
    }

    console.log('Building the client…');
    const build = spawnSync(path.join(REPO_ROOT, 'node_modules/.bin/vite'), ['build', '--logLevel', 'warn'], { cwd: REPO_ROOT, stdio: 'inherit' });
    if (build.status !== 0) throw new Error('The client build failed; see above.');

    const running = await startServer(env);
    exitOnSignals(
      async () => {
        await running.close();
        await stopAll();
      },
      { emergency: () => stack.stop() },
    );
    const owner = DEMO_PEOPLE[0];
    console.log('');
    console.log(`Shockwright is running at ${running.url}  (ready in ${((Date.now() - started) / 1000).toFixed(1)} s)`);
    console.log(`Demo sign-in: ${owner.email} / ${DEMO_PASSWORD}  (team owner; colleagues ${DEMO_PEOPLE.slice(1).map((p) => p.email).join(', ')} use the same password)`);
    console.log('Press Ctrl-C to stop (PostgreSQL stops with it).');
  } catch (err) {
    await stopAll();
    throw err;
  }
}

main().catch((err) => {
  console.error((err as Error).message);
  process.exit(1);
});
