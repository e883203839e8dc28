import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import type { Point } from '@shared/model/sketch';
import { CURSOR_STALE_AFTER_MS, type Highlight, type Person, type ServerMessage, type View, type WalkthroughState } from '@shared/protocol/messages';

export type ConnectionState = 'connecting' | 'online' | 'offline';

export interface RemoteCursor {
  connectionId: string;
  userId: string;
  name: string;
  colour: string;
  cursor: Point | null;
  selection: number[];
  /** When the last presence message arrived (ms, performance clock). */
  at: number;
}

/**
 * Who is in the open sketch with me, where their cursors are, and the walkthrough state. Only
 * what the server relays; nothing here is stored. The store never touches the socket: the
 * channel composable (useSketchChannel) feeds it.
 */
export const useCollabStore = defineStore('collab', () => {
  const connection = ref<ConnectionState>('connecting');
  const connectionError = ref<string | null>(null);
  const you = shallowRef<Person | null>(null);
  const people = shallowRef<Person[]>([]);
  const cursors = shallowRef<Map<string, RemoteCursor>>(new Map());
  const walkthrough = shallowRef<WalkthroughState>(null);
  /** The lead's latest view and highlight (followers apply it while following). */
  const leadView = shallowRef<{ view: View; highlight: Highlight } | null>(null);
  /** A follower can step out of the walkthrough and rejoin it. */
  const following = ref(true);
  /** Ticks every second so stale cursors disappear. */
  const clock = ref(performance.now());
  /** Names of everyone seen in this sketch, kept after they leave (a change they made is still theirs). */
  const names = new Map<string, string>();

  const leading = computed(() => !!walkthrough.value && walkthrough.value.leadUserId === you.value?.userId);
  const followingNow = computed(() => !!walkthrough.value && !leading.value && following.value);
  /** Other connections, one entry per person and connection, with their colour. */
  const others = computed(() => people.value.filter((p) => p.connectionId !== you.value?.connectionId));
  const visibleCursors = computed(() =>
    [...cursors.value.values()].filter((c) => c.cursor && clock.value - c.at < CURSOR_STALE_AFTER_MS && people.value.some((p) => p.connectionId === c.connectionId)),
  );

  function receive(msg: ServerMessage) {
    switch (msg.type) {
      case 'joined':
        you.value = msg.you;
        people.value = msg.people;
        for (const p of msg.people) names.set(p.userId, p.name);
        walkthrough.value = msg.walkthrough;
        following.value = true;
        return;
      case 'people': {
        people.value = msg.people;
        for (const p of msg.people) names.set(p.userId, p.name);
        const present = new Set(msg.people.map((p) => p.connectionId));
        const next = new Map([...cursors.value].filter(([id]) => present.has(id)));
        if (next.size !== cursors.value.size) cursors.value = next;
        return;
      }
      case 'presence': {
        const person = people.value.find((p) => p.connectionId === msg.connectionId);
        const next = new Map(cursors.value);
        next.set(msg.connectionId, {
          connectionId: msg.connectionId,
          userId: msg.userId,
          name: person?.name ?? 'Someone',
          colour: person?.colour ?? '#ffffff',
          cursor: msg.cursor,
          selection: msg.selection,
          at: performance.now(),
        });
        cursors.value = next;
        return;
      }
      case 'walkthrough':
        if (!walkthrough.value || walkthrough.value.leadUserId !== msg.state?.leadUserId) following.value = true;
        walkthrough.value = msg.state;
        if (!msg.state) leadView.value = null;
        return;
      case 'walkthroughView':
        leadView.value = { view: msg.view, highlight: msg.highlight };
        return;
      case 'access':
        // A new role shows on my own card; without one the server has taken me out of the room.
        if (msg.role && you.value) you.value = { ...you.value, role: msg.role };
        if (!msg.role) {
          people.value = [];
          cursors.value = new Map();
          walkthrough.value = null;
        }
        return;
      default:
        return;
    }
  }

  /** Who a user id is, for "changed by …" (the person's own id in another window says so). */
  function nameOf(userId: string | null): string {
    if (!userId) return 'Someone';
    if (userId === you.value?.userId) return 'You (in another window)';
    return names.get(userId) ?? 'A colleague';
  }

  function tick() {
    clock.value = performance.now();
  }

  function reset() {
    connection.value = 'connecting';
    connectionError.value = null;
    you.value = null;
    people.value = [];
    cursors.value = new Map();
    walkthrough.value = null;
    leadView.value = null;
    following.value = true;
    names.clear();
  }

  return { connection, connectionError, you, people, others, cursors, visibleCursors, walkthrough, leadView, following, leading, followingNow, receive, nameOf, tick, reset };
});
