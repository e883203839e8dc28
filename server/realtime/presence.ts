import { PEOPLE_REFRESH_MS, type Person } from '../../shared/protocol/messages.ts';
import { itemAt } from '../../shared/util/invariant.ts';
import { localSketches, room, send, type Hub, type IoSocket } from './hub.ts';
import { errorForLog } from '../log.ts';

/** Eight colours that stay distinct on the canvas background; a person keeps theirs everywhere. */
const PERSON_COLOURS = ['#e4572e', '#17bebb', '#ffc914', '#a855f7', '#76b041', '#f472b6', '#3b82f6', '#f97316'];
export function personColour(userId: string): string {
  let h = 0;
  for (const c of userId) h = (h * 31 + c.charCodeAt(0)) >>> 0;
  return itemAt(PERSON_COLOURS, h % PERSON_COLOURS.length);
}

export interface Presence {
  /** Everyone in the sketch on every instance (waits for each instance the adapter knows). */
  peopleIn(sketchId: string): Promise<Person[]>;
  /** At once: this instance's people and the other instances' as last heard. */
  quickPeople(sketchId: string): Person[];
  /** Sends the full people list to everyone in the sketch, in the background. */
  broadcastPeople(sketchId: string): void;
  /** Relays a cursor and selection to the others, volatile [R4]. */
  relay(socket: IoSocket, sketchId: string, cursor: [number, number] | null, selection: number[]): void;
  stop(): void;
}

/**
 * Who is in each sketch, across instances. A join never waits for the other instances: it is
 * answered with `quickPeople`, and the full list (`broadcastPeople`) follows when every instance
 * has answered — a dead one holds that answer until the adapter gives up on it, seconds later
 * [E3]. Every PEOPLE_REFRESH_MS each instance re-sends its rooms' lists (heals a join seen
 * before two instances discovered each other, or a list lost with a crashed instance).
 */
export function createPresence(hub: Hub): Presence {
  const { io, ctx } = hub;
  /** The people on other instances as last heard, per sketch. */
  const remotePeople = new Map<string, Person[]>();
  /** Sketches whose people list is being gathered, and whether it must be gathered again after. */
  const gathering = new Map<string, boolean>();

  function localPeople(sketchId: string): Person[] {
    const ids = io.of('/').adapter.rooms.get(room(sketchId)) ?? new Set<string>();
    return [...ids].map((id) => io.of('/').sockets.get(id)?.data.people?.[sketchId]).filter((p): p is Person => Boolean(p));
  }

  async function peopleIn(sketchId: string): Promise<Person[]> {
    const here = new Set(localPeople(sketchId).map((p) => p.connectionId));
    const sockets = await io.in(room(sketchId)).fetchSockets();
    const people = sockets.map((s) => s.data.people?.[sketchId]).filter((p): p is Person => Boolean(p));
    remotePeople.set(sketchId, people.filter((p) => !here.has(p.connectionId)));
    return people;
  }

  function broadcastPeople(sketchId: string): void {
    if (gathering.has(sketchId)) {
      // Folded into one more round after the one under way.
      gathering.set(sketchId, true);
      return;
    }
    gathering.set(sketchId, false);
    void (async () => {
      try {
        do {
          gathering.set(sketchId, false);
          try {
            send(io.to(room(sketchId)), { type: 'people', sketchId, people: await peopleIn(sketchId) });
          } catch (err) {
            ctx.log(`[realtime] people list for ${sketchId}: ${errorForLog(err, false)}`);
          }
        } while (gathering.get(sketchId));
      } finally {
        gathering.delete(sketchId);
        if (!io.of('/').adapter.rooms.has(room(sketchId))) remotePeople.delete(sketchId);
      }
    })();
  }

  const refresh = setInterval(() => {
    for (const sketchId of localSketches(io)) broadcastPeople(sketchId);
  }, PEOPLE_REFRESH_MS);
  refresh.unref();

  return {
    peopleIn,
    quickPeople: (sketchId) => [...(remotePeople.get(sketchId) ?? []), ...localPeople(sketchId)],
    broadcastPeople,
    relay(socket, sketchId, cursor, selection) {
      // Volatile: dropped rather than queued when a peer is slow [R4].
      socket.to(room(sketchId)).volatile.emit('message', { type: 'presence', sketchId, connectionId: socket.id, userId: socket.data.user.id, cursor, selection });
    },
    stop() {
      clearInterval(refresh);
    },
  };
}
