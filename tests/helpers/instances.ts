import type { ServerMessage } from '../../shared/protocol/messages.ts';
import { RT_PASSWORD } from './realtimeWorld.ts';
import type { ServerProcess } from './serverProcess.ts';
import { signInCookie, simClient, until } from './simClient.ts';

/**
 * Waits until two server instances know each other (the adapter's heartbeat): someone joining on
 * the second shows in the people list of a member on the first. Instances that have not met yet
 * would send people lists and broadcasts only to their own sockets.
 */
export async function untilInstancesMeet(procs: [ServerProcess, ServerProcess], sketchId: string, emails: [string, string]): Promise<void> {
  const watcherCookie = await signInCookie(procs[0].url, emails[0], RT_PASSWORD);
  const visitorCookie = await signInCookie(procs[1].url, emails[1], RT_PASSWORD);
  const watcher = simClient(procs[0].url, watcherCookie);
  try {
    watcher.engine.join(sketchId);
    await until(() => watcher.engine.state !== null, 30_000, 'watcher joined');
    await until(async () => {
      const from = watcher.received.length;
      const visitor = simClient(procs[1].url, visitorCookie);
      try {
        await until(() => visitor.socket.connected, 30_000, 'visitor connected');
        visitor.engine.join(sketchId);
        const seen = (m: ServerMessage) => (m.type === 'people' || m.type === 'joined') && m.people.length >= 2;
        return await watcher.waitFor(seen, 2000, from).then(() => true, () => false);
      } finally {
        visitor.close();
      }
    }, 60_000, 'the two instances see each other');
  } finally {
    watcher.close();
  }
}

/** The people list a client last heard (joined or people), as names. */
export function lastPeople(received: ServerMessage[]): string[] | null {
  const m = received.findLast((r) => r.type === 'people' || r.type === 'joined');
  return m && (m.type === 'people' || m.type === 'joined') ? m.people.map((p) => p.name).sort() : null;
}
