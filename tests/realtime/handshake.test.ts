import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { io as connect, type Socket } from 'socket.io-client';
import { startServer, type RunningServer } from '../../server/index.ts';
import { seedDemoOnce, DEMO_PASSWORD, DEMO_PEOPLE } from '../../server/db/seed.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/database.ts';
import { testEnv } from '../helpers/app.ts';
import { sessionCookie } from '../helpers/world.ts';
import { itemAt } from '../../shared/util/invariant.ts';

function attempt(url: string, headers: Record<string, string>, transport: 'websocket' | 'polling'): Promise<{ ok: true; socket: Socket } | { ok: false; message: string }> {
  return new Promise((resolve) => {
    const socket = connect(url, { transports: [transport], extraHeaders: headers, reconnection: false, forceNew: true });
    socket.on('connect', () => resolve({ ok: true, socket }));
    socket.on('connect_error', (err) => {
      socket.close();
      resolve({ ok: false, message: String((err as Error & { context?: { responseText?: string } }).context?.responseText ?? err.message) });
    });
  });
}

describe('socket.io handshake reuses the Express session', () => {
  let database: TestDatabase;
  let server: RunningServer;
  let cookie: string;

  beforeAll(async () => {
    database = await createTestDatabase();
    await seedDemoOnce(database.db);
    server = await startServer(testEnv(database.url), { log: () => {} });
    const res = await fetch(`${server.url}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-shockwright-request': '1' },
      body: JSON.stringify({ email: itemAt(DEMO_PEOPLE, 1).email, password: DEMO_PASSWORD }),
    });
    cookie = sessionCookie(res.headers.getSetCookie());
  });
  afterAll(async () => {
    await server?.close();
    await database?.drop();
  });

  it.each(['polling', 'websocket'] as const)('refuses an unauthenticated socket (%s)', async (transport) => {
    const result = await attempt(server.url, {}, transport);
    expect(result.ok).toBe(false);
  });

  it('refuses a socket with a forged session cookie', async () => {
    const result = await attempt(server.url, { cookie: 'sw.sid=s%3Aforged.signature' }, 'polling');
    expect(result).toEqual({ ok: false, message: expect.stringContaining('Sign in to connect') });
  });

  it('refuses a handshake from another site (Origin mismatch), even with a valid cookie', async () => {
    const result = await attempt(server.url, { cookie, origin: 'https://evil.example' }, 'polling');
    expect(result).toEqual({ ok: false, message: expect.stringContaining('another site') });
  });

  it('accepts a signed-in socket and knows who it is', async () => {
    const result = await attempt(server.url, { cookie }, 'websocket');
    expect(result.ok).toBe(true);
    if (result.ok) result.socket.close();
  });
});

describe('behind a proxy the handshake honours the same forwarded-host rule as REST', () => {
  let database: TestDatabase;
  const servers: RunningServer[] = [];

  beforeAll(async () => {
    database = await createTestDatabase();
    await seedDemoOnce(database.db);
  });
  afterAll(async () => {
    for (const s of servers) await s.close();
    await database?.drop();
  });

  async function serverWith(trustProxy: string): Promise<{ server: RunningServer; cookie: string }> {
    const server = await startServer(testEnv(database.url, { TRUST_PROXY: trustProxy }), { log: () => {} });
    servers.push(server);
    const res = await fetch(`${server.url}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-shockwright-request': '1' },
      body: JSON.stringify({ email: itemAt(DEMO_PEOPLE, 1).email, password: DEMO_PASSWORD }),
    });
    return { server, cookie: sessionCookie(res.headers.getSetCookie()) };
  }

  const viaProxy = (cookie: string) => ({ cookie, origin: 'https://shockwright.example', 'x-forwarded-host': 'shockwright.example' });

  it('a trusted proxy’s X-Forwarded-Host is the host the page must come from — for REST and for the socket alike', async () => {
    const { server, cookie } = await serverWith('true');
    const rest = await fetch(`${server.url}/api/teams`, { method: 'POST', headers: { ...viaProxy(cookie), 'content-type': 'application/json', 'x-shockwright-request': '1' }, body: JSON.stringify({ name: 'Via proxy' }) });
    expect(rest.status).toBe(201);
    const socket = await attempt(server.url, viaProxy(cookie), 'polling');
    expect(socket.ok).toBe(true);
    if (socket.ok) socket.socket.close();
    const foreign = await attempt(server.url, { ...viaProxy(cookie), origin: 'https://evil.example' }, 'polling');
    expect(foreign).toEqual({ ok: false, message: expect.stringContaining('another site') });
  });

  it('from a peer TRUST_PROXY does not name, X-Forwarded-Host is ignored — REST and socket both refuse', async () => {
    const { server, cookie } = await serverWith('10.1.2.3');
    const rest = await fetch(`${server.url}/api/teams`, { method: 'POST', headers: { ...viaProxy(cookie), 'content-type': 'application/json', 'x-shockwright-request': '1' }, body: JSON.stringify({ name: 'Via proxy' }) });
    expect(rest.status).toBe(403);
    const socket = await attempt(server.url, viaProxy(cookie), 'polling');
    expect(socket).toEqual({ ok: false, message: expect.stringContaining('another site') });
  });
});
