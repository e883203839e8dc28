/**
 * `npm start`: local PostgreSQL (unless DATABASE_URL is set) → migrations → demo seed (once) →
 * client build → serve API and client on one port. Ctrl-C (or SIGTERM/SIGHUP) stops the server
 * and the cluster at any stage, also while the database starts or the client builds.
 */
import { spawn } from 'node:child_process';
import path from 'node:path';
import { REPO_ROOT } from '../app.ts';
import { openDatabase, type Database } from '../db/client.ts';
import { DEMO_PASSWORD, DEMO_PEOPLE, seedDemoOnce } from '../db/seed.ts';
import { exitOnSignals, keepRunningOnStrayRejections, startServer, type RunningServer } from '../index.ts';
import { stopOnAnyExit } from './crashGuard.ts';
import { bringUpDatabase, precheckEnv } from './localStack.ts';
import type { Cluster } from './postgres.ts';
import { startMailSink, type MailSink } from '../mail/sink.ts';
import { parseEnv } from '../env.ts';
import { commandStartedAt } from './system.ts';

const seconds = (ms: number) => `${(ms / 1000).toFixed(1)} s`;

async function main(): Promise<void> {
  // The wait a person sees starts when they typed `npm start`: npm's own start and the install
  // step (prestart) happen before this process exists.
  const started = commandStartedAt();
  const phases: string[] = [];
  let phaseStart = Date.now();
  const phase = (name: string) => {
    phases.push(`${name} ${seconds(Date.now() - phaseStart)}`);
    phaseStart = Date.now();
  };
  phases.push(`install and launch ${seconds(phaseStart - started)}`);

  let cluster: Cluster | null = null; // known as soon as it runs, before the stack is complete
  let sinkDb: Database | null = null;
  let sink: MailSink | null = null;
  let running: RunningServer | null = null;
  let stopped = false;
  const stopAll = async () => {
    if (stopped) return;
    stopped = true;
    await running?.close();
    await sink?.close();
    await sinkDb?.close();
    cluster?.stop();
  };
  // From the first moment: a Ctrl-C while PostgreSQL starts or the client builds still stops
  // the cluster. A second Ctrl-C stops PostgreSQL at once and exits.
  exitOnSignals(stopAll, { emergency: () => cluster?.stop() });

  try {
    precheckEnv();
    const stack = await bringUpDatabase({ onClusterStarted: (c) => (cluster = c) });
    stopOnAnyExit(() => cluster?.stop());
    keepRunningOnStrayRejections();
    sinkDb = openDatabase(stack.env.DATABASE_URL, { max: 2 });
    const seeded = await seedDemoOnce(sinkDb.db);
    console.log(seeded === 'seeded' ? 'Demo data seeded.' : 'Demo data already present.');
    phase('database');

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
    // Asynchronous, so a Ctrl-C during the build is handled at once.
    const build = spawn(path.join(REPO_ROOT, 'node_modules/.bin/vite'), ['build', '--logLevel', 'warn'], { cwd: REPO_ROOT, stdio: 'inherit' });
    const built = await new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => {
      build.once('error', () => resolve({ code: null, signal: null }));
      build.once('exit', (code, signal) => resolve({ code, signal }));
    });
    // A Ctrl-C reaches the build too (same process group); our own handler is stopping everything.
    if (stopped || built.signal === 'SIGINT') return;
    if (built.code !== 0) throw new Error('The client build failed; see above.');
    phase('client build');

    running = await startServer(env);
    phase('server');
    const owner = DEMO_PEOPLE[0];
    console.log('');
    console.log(`Shockwright is running at ${running.url}  (ready in ${seconds(Date.now() - started)}: ${phases.join(', ')})`);
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
