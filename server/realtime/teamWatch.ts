import { TEAM_NOTICE_INTERVAL_MS, type ClientMessage } from '../../shared/protocol/messages.ts';
import { ACCESS_SWEEP_MS, type AccessFilter } from './access.ts';
import { checkTeamAccess, findSketchTeam } from './repository.ts';
import { logged, send, type Hub, type IoSocket } from './hub.ts';

/** The socket.io room of a team's sketch list (spans instances through the adapter). */
export const teamRoom = (teamId: string) => `team:${teamId}`;
/** The room of one person's own connections (news about their own teams only) [T5]. */
export const personRoom = (userId: string) => `person:${userId}`;

/** What the team watch needs from the access guard. */
export interface TeamWatchGuard {
  sessionOf(socket: IoSocket): string;
  inLane(socket: IoSocket, task: () => Promise<void>): Promise<void>;
  endSession(socket: IoSocket): void;
}

export interface TeamWatch {
  /** A new connection joins its person's own room [T5]. */
  register(socket: IoSocket): Promise<void>;
  /** `watchTeam` / `unwatchTeam` from a home page. */
  handle(socket: IoSocket, msg: Extract<ClientMessage, { type: 'watchTeam' | 'unwatchTeam' }>, fail: (code: string, reason: string) => void): Promise<void>;
  /** Something in the team's sketch list changed (an edit through the socket, whose team is known). */
  changed(teamId: string): void;
  stop(): void;
}

/**
 * The home table's live list [T1]–[T4] (server/realtime/README.md): a socket watches one or more
 * teams it is a member of; whenever a sketch of the team is created, duplicated, renamed, edited,
 * deleted or its review status changes, the team's watchers get `teamSketches` — the team's id
 * and nothing about the sketch — and fetch the list again through the API, which checks their
 * membership once more. Membership is checked when the watch starts (from the database), when
 * a service announces an access change (every instance re-checks its matching watches at once)
 * and in the periodic sweep; a watcher who is no longer a member leaves the team's room and gets
 * `teamAccess` with `role: null` before any further notice could reach them.
 */
export function createTeamWatch(hub: Hub, guard: TeamWatchGuard): TeamWatch {
  const { io, ctx } = hub;

  /** Notices of one team, at most one per TEAM_NOTICE_INTERVAL_MS (the last one always follows). */
  const throttles = new Map<string, { last: number; timer: NodeJS.Timeout | null }>();
  function changed(teamId: string): void {
    let t = throttles.get(teamId);
    if (!t) {
      t = { last: 0, timer: null };
      throttles.set(teamId, t);
    }
    if (t.timer) return;
    const wait = TEAM_NOTICE_INTERVAL_MS - (performance.now() - t.last);
    const fire = () => {
      const entry = throttles.get(teamId);
      if (entry) {
        entry.timer = null;
        entry.last = performance.now();
      }
      send(io.to(teamRoom(teamId)), { type: 'teamSketches', teamId });
    };
    if (wait <= 0) fire();
    else {
      t.timer = setTimeout(fire, wait);
      t.timer.unref();
    }
  }
  const sketchChanged = (sketchId: string) => {
    findSketchTeam(ctx.db, sketchId).then((teamId) => {
      if (teamId) changed(teamId);
    }, logged(hub, 'team notice'));
  };

  const onTeamChanged = (teamId: string) => changed(teamId);
  const onEdited = (sketchId: string) => sketchChanged(sketchId);
  const onNotice = (sketchId: string, topic: string) => {
    if (topic === 'status') sketchChanged(sketchId);
  };
  const onTeams = (userId: string) => send(io.to(personRoom(userId)), { type: 'teamsChanged' });
  ctx.events.on('teamsChanged', onTeams);
  ctx.events.on('teamSketchesChanged', onTeamChanged);
  ctx.events.on('sketchEdited', onEdited);
  ctx.events.on('sketchNotice', onNotice);

  /** Stops the socket watching `teamId` and tells it why (before anything else can reach it). */
  async function evict(socket: IoSocket, teamId: string, reason: string): Promise<void> {
    if (!socket.data.teams.has(teamId)) return;
    socket.data.teams.delete(teamId);
    await socket.leave(teamRoom(teamId));
    send(socket, { type: 'teamAccess', teamId, role: null, reason });
  }

  /** Re-checks this instance's team watches that `filter` concerns (all of them for the sweep). */
  async function recheck(filter: AccessFilter): Promise<void> {
    // A sketch's deletion changes nobody's membership (its list notice goes out on its own).
    if (filter.sketchId && !filter.teamId && !filter.userId) return;
    const sockets = [...io.of('/').sockets.values()].filter(
      (s) => s.data.teams?.size && (!filter.userId || s.data.user.id === filter.userId) && (!filter.teamId || s.data.teams.has(filter.teamId)),
    );
    const checks = sockets.flatMap((socket) =>
      [...socket.data.teams.keys()].filter((teamId) => !filter.teamId || teamId === filter.teamId).map((teamId) => ({ socket, teamId })),
    );
    if (checks.length === 0) return;
    const results = await checkTeamAccess(
      ctx.db,
      checks.map(({ socket, teamId }) => ({ sessionId: guard.sessionOf(socket), userId: socket.data.user.id, teamId })),
    );
    await Promise.all(
      checks.map(({ socket, teamId }, i) => {
        const result = results[i];
        if (!result) return Promise.resolve();
        return guard
          .inLane(socket, async () => {
            if (!result.sessionLive) return guard.endSession(socket);
            const before = socket.data.teams.get(teamId);
            if (!before) return;
            if (!result.role) return evict(socket, teamId, result.teamExists ? 'You are no longer a member of this team.' : 'This team was deleted.');
            if (result.role !== before.role) {
              before.role = result.role;
              send(socket, { type: 'teamAccess', teamId, role: result.role, reason: `Your role in this team is now ${result.role}.` });
            }
          })
          .catch(logged(hub, 'team access re-check failed'));
      }),
    );
  }

  const onAccessChanged = (filter: AccessFilter) => void recheck(filter).catch(logged(hub, 'team access re-check failed'));
  ctx.events.on('accessChanged', onAccessChanged);
  io.on('accessChanged', onAccessChanged);
  const sweep = setInterval(() => void recheck({}).catch(logged(hub, 'team access sweep failed')), ACCESS_SWEEP_MS);
  sweep.unref();

  return {
    async register(socket) {
      await socket.join(personRoom(socket.data.user.id));
    },
    async handle(socket, msg, fail) {
      if (msg.type === 'unwatchTeam') {
        socket.data.teams.delete(msg.teamId);
        await socket.leave(teamRoom(msg.teamId));
        return;
      }
      const check = async () => (await checkTeamAccess(ctx.db, [{ sessionId: guard.sessionOf(socket), userId: socket.data.user.id, teamId: msg.teamId }]))[0];
      const admitted = await check();
      if (!admitted?.sessionLive) return guard.endSession(socket);
      if (!admitted.role) return fail('not_found', 'No such team, or you are not a member of it.');
      socket.data.teams.set(msg.teamId, { role: admitted.role });
      await socket.join(teamRoom(msg.teamId));
      // Checked once more now that the watch is recorded: a removal committed while the first
      // check ran is seen here, and one committed later finds the watch when its re-check runs —
      // no window in which a removed member keeps hearing the team (before this, up to the sweep).
      const now = await check();
      const watch = socket.data.teams.get(msg.teamId);
      if (!now?.sessionLive) return guard.endSession(socket);
      if (!now.role || !watch) return evict(socket, msg.teamId, now.teamExists ? 'You are no longer a member of this team.' : 'This team was deleted.');
      watch.role = now.role;
      send(socket, { type: 'teamWatched', teamId: msg.teamId, role: now.role });
    },
    changed,
    stop() {
      clearInterval(sweep);
      for (const t of throttles.values()) if (t.timer) clearTimeout(t.timer);
      ctx.events.off('teamSketchesChanged', onTeamChanged);
      ctx.events.off('teamsChanged', onTeams);
      ctx.events.off('sketchEdited', onEdited);
      ctx.events.off('sketchNotice', onNotice);
      ctx.events.off('accessChanged', onAccessChanged);
    },
  };
}
