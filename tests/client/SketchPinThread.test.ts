import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import type { PinDetail } from '@shared/model/review';
import type { Member } from '@shared/model/teams';
import { itemAt } from '@shared/util/invariant';

const apiMock = vi.hoisted(() => ({ get: vi.fn(), patch: vi.fn(), post: vi.fn(), put: vi.fn(), delete: vi.fn() }));
vi.mock('@/api/client', async (importOriginal) => {
  const real = await importOriginal<typeof import('@/api/client')>();
  return { ...real, api: apiMock };
});

const { default: SketchPinThread } = await import('@/components/SketchPinThread.vue');
const { ApiError } = await import('@/api/client');

const PIN = 'pin_aaaaaaaaaaaaaaaaaaaa';
const TOMASZ = 'user_tomaszaaaaaaaaaaaa';
const MEMBERS: Member[] = [
  { userId: 'user_inesaaaaaaaaaaaaaaa', name: 'Ines Marlow', email: 'ines@harrowgate.example', role: 'owner', since: '2030-01-01T00:00:00.000Z' },
  { userId: TOMASZ, name: 'Tomasz Reyes', email: 'tomasz@harrowgate.example', role: 'editor', since: '2030-01-01T00:00:00.000Z' },
  { userId: 'user_priyaaaaaaaaaaaaaaa', name: 'Priya Vance', email: 'priya@harrowgate.example', role: 'reviewer', since: '2030-01-01T00:00:00.000Z' },
];

function detail(extra: Partial<PinDetail> = {}): PinDetail {
  return {
    id: PIN,
    sketchId: 'sketch_aaaaaaaaaaaaaaaaaaaa',
    target: { kind: 'wave', waveId: 'wave_lower_0', label: 'Oblique shock · lower surface, vertex 0', at: [0.2, -0.15] },
    status: 'open',
    authorName: 'Priya Vance',
    firstBody: '@Tomasz Reyes is this shock still attached at α 6°?',
    replyCount: 0,
    createdAt: '2030-03-04T09:15:00.000Z',
    updatedAt: '2030-03-04T09:15:00.000Z',
    resolvedByName: null,
    replies: [
      { id: 'reply_a', authorId: 'user_priyaaaaaaaaaaaaaaa', authorName: 'Priya Vance', body: '@Tomasz Reyes is this shock still attached at α 6°?', mentions: [TOMASZ], createdAt: '2030-03-04T09:15:00.000Z' },
    ],
    ...extra,
  };
}

function mountThread(canReview = true) {
  return mount(SketchPinThread, { props: { pinId: PIN, canReview, members: MEMBERS }, attachTo: document.body });
}

const get = (w: ReturnType<typeof mountThread>, id: string) => w.get(`[data-testid="${id}"]`);

describe('SketchPinThread', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    apiMock.get.mockImplementation(async (url: string) => {
      if (url === `/api/pins/${PIN}`) return detail();
      throw new Error(`unexpected GET ${url}`);
    });
  });
  afterEach(() => {
    vi.clearAllMocks();
    document.body.innerHTML = '';
  });

  it('shows what the pin points at and each comment with its author, time and highlighted mention', async () => {
    const w = mountThread();
    await flushPromises();
    expect(get(w, 'pin-thread-target').text()).toBe('Oblique shock · lower surface, vertex 0');
    expect(get(w, 'pin-thread-status').text()).toBe('open');
    const replies = w.findAll('[data-testid="pin-reply"]');
    expect(replies).toHaveLength(1);
    const reply = itemAt(replies, 0);
    expect(reply.get('[data-testid="pin-reply-author"]').text()).toBe('Priya Vance');
    expect(reply.get('time').attributes('datetime')).toBe('2030-03-04T09:15:00.000Z');
    expect(reply.get('time').text()).toMatch(/2030/);
    expect(reply.get('mark').text()).toBe('@Tomasz Reyes');
    expect(w.emitted('loaded')).toBeDefined();
    expect(itemAt(w.emitted('loaded') ?? [], 0)[0]).toMatchObject({ id: PIN });
    w.unmount();
  });

  it('posts a reply with the people it mentions and shows the answer the server returns', async () => {
    const answered = detail({
      replyCount: 1,
      replies: [
        ...detail().replies,
        { id: 'reply_b', authorId: TOMASZ, authorName: 'Tomasz Reyes', body: 'Attached up to 7.1°. @Ines Marlow FYI', mentions: ['user_inesaaaaaaaaaaaaaaa'], createdAt: '2030-03-04T10:00:00.000Z' },
      ],
    });
    apiMock.post.mockResolvedValueOnce(answered);
    const w = mountThread();
    await flushPromises();
    await get(w, 'pin-reply-box').get('textarea').setValue('Attached up to 7.1°. @Ines Marlow FYI');
    expect(get(w, 'pin-reply-box-mentions').text()).toBe('E-mails a notice to Ines Marlow.');
    await get(w, 'pin-reply-box-submit').trigger('click');
    await flushPromises();
    expect(apiMock.post).toHaveBeenCalledWith(`/api/pins/${PIN}/replies`, { body: 'Attached up to 7.1°. @Ines Marlow FYI', mentions: ['user_inesaaaaaaaaaaaaaaa'] }, expect.anything());
    const authors = w.findAll('[data-testid="pin-reply-author"]').map((a) => a.text());
    expect(authors).toEqual(['Priya Vance', 'Tomasz Reyes']);
    expect((get(w, 'pin-reply-box').get('textarea').element as HTMLTextAreaElement).value).toBe('');
    w.unmount();
  });

  it('keeps the text and shows the server’s reason when a reply is refused', async () => {
    apiMock.post.mockRejectedValueOnce(new ApiError(403, 'forbidden', 'Your role on this team cannot reply on review pins.'));
    const w = mountThread();
    await flushPromises();
    await get(w, 'pin-reply-box').get('textarea').setValue('Looks fine to me');
    await get(w, 'pin-reply-box-submit').trigger('click');
    await flushPromises();
    expect(get(w, 'pin-reply-box').get('[role="alert"]').text()).toBe('Your role on this team cannot reply on review pins.');
    expect((get(w, 'pin-reply-box').get('textarea').element as HTMLTextAreaElement).value).toBe('Looks fine to me');
    w.unmount();
  });

  it('resolves and reopens through the API, showing who resolved it', async () => {
    apiMock.post.mockResolvedValueOnce(detail({ status: 'resolved', resolvedByName: 'Priya Vance' }));
    const w = mountThread();
    await flushPromises();
    await get(w, 'pin-resolve').trigger('click');
    await flushPromises();
    expect(apiMock.post).toHaveBeenCalledWith(`/api/pins/${PIN}/resolve`, {}, expect.anything());
    expect(get(w, 'pin-thread-status').text()).toBe('resolved');
    expect(w.text()).toContain('Resolved by Priya Vance.');
    apiMock.post.mockResolvedValueOnce(detail());
    await get(w, 'pin-reopen').trigger('click');
    await flushPromises();
    expect(apiMock.post).toHaveBeenLastCalledWith(`/api/pins/${PIN}/reopen`, {}, expect.anything());
    expect(get(w, 'pin-thread-status').text()).toBe('open');
    w.unmount();
  });

  it('a viewer reads the thread with no reply box and no resolve button', async () => {
    const w = mountThread(false);
    await flushPromises();
    expect(w.findAll('[data-testid="pin-reply"]')).toHaveLength(1);
    expect(w.find('[data-testid="pin-reply-box"]').exists()).toBe(false);
    expect(w.find('[data-testid="pin-resolve"]').exists()).toBe(false);
    expect(get(w, 'pin-thread-readonly').text()).toContain('reviewers, editors and owners reply and resolve');
    w.unmount();
  });
});
