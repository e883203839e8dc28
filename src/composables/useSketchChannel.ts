import { onBeforeUnmount, watch, type Ref } from 'vue';
import { io, type Socket } from 'socket.io-client';
import { useSketchStore } from '@/stores/sketch';
import { useCollabStore } from '@/stores/collab';
import type { Point } from '@shared/model/sketch';
import { CURSOR_BROADCAST_INTERVAL_MS, WALKTHROUGH_VIEW_INTERVAL_MS, type ClientMessage, type ClientToServerEvents, type Highlight, type ServerMessage, type ServerToClientEvents, type View } from '@shared/protocol/messages';
import { SYNC_TICK_MS } from '@/timing';

/** Calls `send(value)` at most once per `intervalMs`, always delivering the newest value. */
function throttle<T>(intervalMs: number, send: (value: T) => void) {
  let last = 0;
  let pending: { value: T } | null = null;
  let timer: ReturnType<typeof setTimeout> | null = null;
  const flush = () => {
    timer = null;
    if (!pending) return;
    last = performance.now();
    const { value } = pending;
    pending = null;
    send(value);
  };
  return {
    push(value: T) {
      pending = { value };
      const wait = intervalMs - (performance.now() - last);
      if (wait <= 0) flush();
      else timer ??= setTimeout(flush, wait);
    },
    cancel() {
      if (timer) clearTimeout(timer);
      timer = null;
      pending = null;
    },
  };
}

/**
 * The sketch editor's realtime channel: one socket.io connection that carries edits (through the
 * sketch store's sync engine), presence (cursor and selection, throttled, volatile), people,
 * walkthrough state and notices. The socket lives here, never in a store. `onNotice` is called
 * for the server's refresh notices (pins, snapshots, status, activity, studies).
 */
export function useSketchChannel(
  sketchId: Ref<string | null>,
  options: {
    onNotice?: (topic: string) => void;
    /** My role in the sketch changed while it was open (null: I no longer have access). */
    onAccess?: (msg: Extract<ServerMessage, { type: 'access' }>) => void;
    /** The server ended this session (signed out elsewhere, password changed). */
    onSignedOut?: (reason: string) => void;
  } = {},
) {
  const store = useSketchStore();
  const collab = useCollabStore();
  collab.reset();

  const socket: Socket<ServerToClientEvents, ClientToServerEvents> = io({
    transports: ['websocket', 'polling'],
    withCredentials: true,
    reconnectionDelay: 250,
    reconnectionDelayMax: 3000,
  });
  const send = (msg: ClientMessage) => {
    socket.emit('message', msg);
  };
  const channel = store.attachChannel(send);

  socket.on('connect', () => {
    collab.connection = 'online';
    collab.connectionError = null;
    channel.connectionOpened();
  });
  socket.on('disconnect', () => {
    collab.connection = 'offline';
    channel.connectionLost();
  });
  socket.on('connect_error', (err) => {
    collab.connection = 'offline';
    collab.connectionError = err.message;
  });
  socket.on('message', (msg: ServerMessage) => {
    channel.receive(msg);
    collab.receive(msg);
    if (msg.type === 'notice') options.onNotice?.(msg.topic);
    if (msg.type === 'access' && msg.sketchId === sketchId.value) options.onAccess?.(msg);
    if (msg.type === 'error' && msg.code === 'signed_out') options.onSignedOut?.(msg.reason);
    else if (msg.type === 'error' && msg.about !== 'edit' && msg.code !== 'internal') {
      store.notice = { kind: 'error', message: msg.reason };
    }
  });

  watch(
    [sketchId, () => store.sketchId],
    ([id, loaded]) => {
      // Join once the store has opened the sketch over HTTP (title, stored result, role).
      if (id && loaded === id) channel.join(id);
    },
    { immediate: true },
  );

  const ticker = setInterval(() => {
    channel.tick();
    collab.tick();
  }, SYNC_TICK_MS);

  const presence = throttle<{ cursor: Point | null; selection: number[] }>(CURSOR_BROADCAST_INTERVAL_MS, (p) => {
    if (sketchId.value && socket.connected) send({ type: 'presence', sketchId: sketchId.value, ...p });
  });
  const walkthroughView = throttle<{ view: View; highlight: Highlight }>(WALKTHROUGH_VIEW_INTERVAL_MS, (v) => {
    if (sketchId.value && socket.connected && collab.leading) send({ type: 'walkthroughView', sketchId: sketchId.value, ...v });
  });

  onBeforeUnmount(() => {
    clearInterval(ticker);
    presence.cancel();
    walkthroughView.cancel();
    socket.close();
    store.detachChannel();
    collab.reset();
  });

  const withSketch = (make: (id: string) => ClientMessage) => {
    if (sketchId.value) send(make(sketchId.value));
  };

  return {
    /** My cursor (section coordinates) and selection, at most ~30 times a second. */
    sendPresence: (cursor: Point | null, selection: number[]) => presence.push({ cursor, selection: [...selection] }),
    startWalkthrough: () => withSketch((id) => ({ type: 'walkthroughStart', sketchId: id })),
    stopWalkthrough: () => withSketch((id) => ({ type: 'walkthroughStop', sketchId: id })),
    handOver: (toUserId: string) => withSketch((id) => ({ type: 'walkthroughHandOver', sketchId: id, toUserId })),
    /** The lead's view and highlight (ignored unless I lead). */
    sendView: (view: View, highlight: Highlight) => walkthroughView.push({ view, highlight }),
  };
}
