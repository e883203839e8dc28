import { roleAtLeast } from '../../shared/model/roles.ts';
import type { ClientMessage, WalkthroughState } from '../../shared/protocol/messages.ts';
import { findWalkthrough, roleInSketchTeam, saveWalkthroughLead } from './repository.ts';
import { room, send, type Hub, type IoSocket } from './hub.ts';
import type { Presence } from './presence.ts';

type WalkthroughMessage = Extract<ClientMessage, { type: 'walkthroughStart' | 'walkthroughStop' | 'walkthroughHandOver' | 'walkthroughView' }>;

export interface Walkthroughs {
  /** Who leads the sketch's walkthrough (stored: shared by every instance). */
  state(sketchId: string): Promise<WalkthroughState>;
  /** When the lead's last connection leaves a sketch, the walkthrough ends. */
  endIfLeadGone(sketchId: string, userId: string): Promise<void>;
  /** Start, stop, hand over, and the lead's view relayed to the followers. */
  handle(socket: IoSocket, msg: WalkthroughMessage, fail: (code: string, reason: string) => void): Promise<void>;
}

/** Walkthroughs: a lead's view followed live by everyone else in the sketch. */
export function createWalkthroughs(hub: Hub, presence: Presence): Walkthroughs {
  const { io, ctx } = hub;
  const state = (sketchId: string): Promise<WalkthroughState> => findWalkthrough(ctx.db, sketchId);
  const currentRole = (sketchId: string, userId: string) => roleInSketchTeam(ctx.db, userId, sketchId);

  async function setLead(sketchId: string, leadUserId: string | null): Promise<void> {
    await saveWalkthroughLead(ctx.db, sketchId, leadUserId);
    send(io.to(room(sketchId)), { type: 'walkthrough', sketchId, state: await state(sketchId) });
  }

  return {
    state,
    async endIfLeadGone(sketchId, userId) {
      const now = await state(sketchId);
      if (!now || now.leadUserId !== userId) return;
      const stillHere = (await presence.peopleIn(sketchId)).some((p) => p.userId === userId);
      if (!stillHere) await setLead(sketchId, null);
    },
    async handle(socket, msg, fail) {
      const user = socket.data.user;
      switch (msg.type) {
        case 'walkthroughStart': {
          const role = await currentRole(msg.sketchId, user.id);
          if (!roleAtLeast(role, 'editor')) return fail('forbidden', 'Leading a walkthrough needs the editor role or higher.');
          const now = await state(msg.sketchId);
          if (now && now.leadUserId !== user.id && (await presence.peopleIn(msg.sketchId)).some((p) => p.userId === now.leadUserId)) {
            return fail('walkthrough_running', `${now.leadName} is leading a walkthrough; ask them to hand over.`);
          }
          return setLead(msg.sketchId, user.id);
        }
        case 'walkthroughStop': {
          const now = await state(msg.sketchId);
          if (!now) return;
          if (now.leadUserId !== user.id && !roleAtLeast(await currentRole(msg.sketchId, user.id), 'owner')) {
            return fail('forbidden', 'Only the lead (or a team owner) can end the walkthrough.');
          }
          return setLead(msg.sketchId, null);
        }
        case 'walkthroughHandOver': {
          const now = await state(msg.sketchId);
          if (!now || now.leadUserId !== user.id) return fail('forbidden', 'Only the lead can hand the walkthrough over.');
          const target = (await presence.peopleIn(msg.sketchId)).find((p) => p.userId === msg.toUserId);
          if (!target) return fail('not_present', 'That person is not in this sketch right now.');
          if (!roleAtLeast(await currentRole(msg.sketchId, target.userId), 'editor')) return fail('forbidden', `${target.name} needs the editor role or higher to lead.`);
          return setLead(msg.sketchId, target.userId);
        }
        case 'walkthroughView': {
          const now = await state(msg.sketchId);
          if (!now || now.leadUserId !== user.id) return fail('forbidden', 'Only the lead steers the walkthrough.');
          socket.to(room(msg.sketchId)).volatile.emit('message', { type: 'walkthroughView', sketchId: msg.sketchId, view: msg.view, highlight: msg.highlight, leadUserId: user.id });
          return;
        }
      }
    },
  };
}
