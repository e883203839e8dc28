import { onBeforeUnmount, ref, watch, type Ref } from 'vue';
import { io, type Socket } from 'socket.io-client';
import type { ClientToServerEvents, ServerMessage, ServerToClientEvents } from '@shared/protocol/messages';

/**
 * The home table's live channel [T1]–[T4] (server/realtime/README.md): one socket.io connection
 * that watches the shown team's sketch list. `onChanged` runs when the list changed (a sketch
 * created, renamed, edited, deleted, its review status) and after every (re)watch, since
 * notices sent while the socket was away are not replayed; `onAccess` when my membership ended
 * or my role changed while the page was open; `onTeams` when I joined or created a team. The
 * socket lives here, never in a store.
 */
export function useTeamChannel(
  teamId: Ref<string | null>,
  handlers: { onChanged: () => void; onAccess: (msg: Extract<ServerMessage, { type: 'teamAccess' }>) => void; onTeams: () => void },
) {
  /** True while the shown team's list is watched (the table updates by itself). */
  const live = ref(false);
  const socket: Socket<ServerToClientEvents, ClientToServerEvents> = io({
    transports: ['websocket', 'polling'],
    withCredentials: true,
    reconnectionDelay: 250,
    reconnectionDelayMax: 3000,
  });
  let watching: string | null = null;

  function watchTeam(id: string | null): void {
    if (watching && watching !== id && socket.connected) socket.emit('message', { type: 'unwatchTeam', teamId: watching });
    watching = id;
    live.value = false;
    if (id && socket.connected) socket.emit('message', { type: 'watchTeam', teamId: id });
  }

  socket.on('connect', () => watchTeam(watching));
  socket.on('disconnect', () => {
    live.value = false;
  });
  socket.on('message', (msg) => {
    if (msg.type === 'teamWatched' && msg.teamId === watching) {
      live.value = true;
      handlers.onChanged();
    } else if (msg.type === 'teamSketches' && msg.teamId === watching) {
      handlers.onChanged();
    } else if (msg.type === 'teamsChanged') {
      handlers.onTeams();
    } else if (msg.type === 'teamAccess' && msg.teamId === watching) {
      if (msg.role === null) live.value = false;
      handlers.onAccess(msg);
    }
  });

  watch(teamId, (id) => watchTeam(id), { immediate: true });
  onBeforeUnmount(() => {
    socket.disconnect();
  });
  return { live };
}
