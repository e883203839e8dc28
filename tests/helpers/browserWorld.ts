import { startServer, type RunningServer } from '../../server/index.ts';
import { seedDemoOnce } from '../../server/db/seed.ts';
import { startMailSink, type MailSink } from '../../server/mail/sink.ts';
import { createTestDatabase, type TestDatabase } from './database.ts';
import { testEnv } from './app.ts';
import { openBrowser, type BrowserSession } from './browser.ts';

export interface BrowserWorld {
  database: TestDatabase;
  server: RunningServer;
  /** The SMTP sink (when asked for): mail lands in the test database's mail_messages. */
  sink: MailSink | null;
  /** One Chromium per person (separate profiles, so separate sessions). */
  browsers: BrowserSession[];
  close(): Promise<void>;
}

/**
 * What a browser test stands on: its own database (with the demo seeded unless `seed: false`),
 * the app served on a free port, optionally a mail sink wired as SMTP_URL, and `browsers`
 * Chromium instances. `beforeServer` runs after seeding (e.g. to read seeded ids).
 */
export async function startBrowserWorld(
  options: { seed?: boolean; mail?: boolean; browsers?: number; beforeServer?: (db: TestDatabase) => Promise<void>; env?: Record<string, string> } = {},
): Promise<BrowserWorld> {
  const database = await createTestDatabase();
  if (options.seed ?? true) await seedDemoOnce(database.db);
  await options.beforeServer?.(database);
  const sink = options.mail ? await startMailSink(database.db) : null;
  const server = await startServer(testEnv(database.url, { ...(sink ? { SMTP_URL: sink.url } : {}), ...options.env }), { log: () => {} });
  const browsers: BrowserSession[] = [];
  for (let i = 0; i < (options.browsers ?? 1); i++) browsers.push(await openBrowser(server.url));
  return {
    database,
    server,
    sink,
    browsers,
    async close() {
      for (const b of browsers) await b.close();
      await server.close();
      await sink?.close();
      await database.drop();
    },
  };
}
