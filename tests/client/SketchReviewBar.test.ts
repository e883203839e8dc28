import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { defaultSketchDocument } from '@shared/model/sketch';
import type { Sketch } from '@shared/model/sketchApi';
import type { Approval } from '@shared/model/review';

const apiMock = vi.hoisted(() => ({ get: vi.fn(), put: vi.fn(), patch: vi.fn(), post: vi.fn(), delete: vi.fn() }));
vi.mock('@/api/client', async (importOriginal) => {
  const real = await importOriginal<typeof import('@/api/client')>();
  return { ...real, api: apiMock };
});
vi.mock('vue-router', async (importOriginal) => ({ ...(await importOriginal<typeof import('vue-router')>()), useRoute: () => ({ query: {} }) }));

const { default: SketchReviewBar } = await import('@/components/SketchReviewBar.vue');
const { useSketchStore } = await import('@/stores/sketch');
const { useSessionStore } = await import('@/stores/session');
const { bumpTopic } = await import('@/composables/useSketchNotices');

const ID = 'sketch_aaaaaaaaaaaaaaaaaaaa';
const APPROVAL: Approval = { revision: 3, byName: 'Priya Vance', at: '2030-03-04T09:15:00.000Z', note: '', changedSince: false };

function sketch(extra: Partial<Sketch> = {}): Sketch {
  return {
    id: ID,
    teamId: 'team_aaaaaaaaaaaaaaaaaaaa',
    title: 'Tern fin root',
    revision: 3,
    document: defaultSketchDocument(),
    lastSolveStatus: null,
    lastResult: null,
    createdAt: '2030-01-01T00:00:00.000Z',
    updatedAt: '2030-01-01T00:00:00.000Z',
    updatedByName: 'Tomasz Reyes',
    reviewStatus: 'approved',
    approval: APPROVAL,
    reviewState: 'approved',
    ...extra,
  };
}

/** The server's answers: the sketch as `stored` says, no pins. */
let stored: Sketch;
function serve() {
  apiMock.get.mockImplementation(async (url: string) => (url.includes('/pins') ? { items: [], total: 0, limit: 100, offset: 0 } : stored));
}

const text = (w: ReturnType<typeof mount>, id: string) => w.get(`[data-testid="${id}"]`).text();

describe('SketchReviewBar: the review state in the editor header', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    Object.values(apiMock).forEach((m) => m.mockReset());
    stored = sketch();
    serve();
  });

  async function openAs(role: 'reviewer' | 'viewer') {
    useSessionStore().me = { user: { id: 'user_ines', email: 'ines@harrowgate.example', name: 'Ines Marlow' }, teams: [], devMailbox: false, mailboxOperator: false };
    const store = useSketchStore();
    await store.open(ID);
    const w = mount(SketchReviewBar, { props: { role }, attachTo: document.body });
    await flushPromises();
    return { store, w };
  }

  it('[A1] shows the approval with its revision and who gave it, the whole record on hover', async () => {
    const { w } = await openAs('viewer');
    expect(text(w, 'review-status')).toBe('Approved');
    expect(w.get('[data-testid="review-status"]').attributes('data-status')).toBe('approved');
    expect(text(w, 'review-approval')).toBe('r3');
    expect(w.get('[data-testid="review-status"]').attributes('title')).toMatch(/^Approved revision 3 by Priya Vance, .+\.$/);
    // A viewer records no outcome.
    expect(w.find('[data-testid="review-decide"]').exists()).toBe(false);
    w.unmount();
  });

  it('[A2] turns to "changed since approval" the moment a colleague’s edit lands over the live channel, and back when approved again', async () => {
    const { store, w } = await openAs('reviewer');
    const channel = store.attachChannel(() => {});
    channel.join(ID);
    channel.receive({ type: 'joined', sketchId: ID, title: 'Tern fin root', document: defaultSketchDocument(), revision: 3, people: [], walkthrough: null, you: { connectionId: 'c', userId: 'user_ines', name: 'Ines Marlow', role: 'reviewer', colour: '#fff' } });
    await flushPromises();
    expect(text(w, 'review-status')).toBe('Approved');

    // Tomasz changes Mach on his machine; the edit arrives as revision 4.
    channel.receive({ type: 'edit', sketchId: ID, revision: 4, userId: 'user_tomasz', op: { type: 'setCondition', opId: 'op_remote', field: 'mach', value: 2.4 } });
    await flushPromises();
    expect(store.revision).toBe(4);
    expect(text(w, 'review-status')).toBe('Changed since approval');
    expect(w.get('[data-testid="review-status"]').attributes('data-status')).toBe('changed_since_approval');
    expect(text(w, 'review-approval')).toBe('r3');
    expect(w.get('[data-testid="review-status"]').attributes('title')).toMatch(/^Approved revision 3 by Priya Vance, .+; changed since \(now revision 4\)\.$/);

    // Someone approves revision 4; the server's status notice brings it.
    stored = sketch({ revision: 4, approval: { ...APPROVAL, revision: 4, byName: 'Oren Adeyemi' } });
    bumpTopic('status');
    await flushPromises();
    expect(text(w, 'review-status')).toBe('Approved');
    expect(text(w, 'review-approval')).toBe('r4');
    expect(w.get('[data-testid="review-approval"]').attributes('title')).toMatch(/^Approved revision 4 by Oren Adeyemi, .+\.$/);
    w.unmount();
  });

  it('a request for changes and a draft read as such, with no approval beside them', async () => {
    stored = sketch({ reviewStatus: 'changes_requested', approval: null, reviewState: 'changes_requested' });
    const { w } = await openAs('reviewer');
    expect(text(w, 'review-status')).toBe('Changes requested');
    expect(w.find('[data-testid="review-approval"]').exists()).toBe(false);
    expect(w.find('[data-testid="review-decide"]').exists()).toBe(true);
    w.unmount();
  });
});
