import { describe, expect, it } from 'vitest';
import { defineComponent, h, nextTick, ref } from 'vue';
import { flushPromises, mount } from '@vue/test-utils';
import { mentionParts, mentionsIn } from '@/composables/useMentions';
import { usePagedList, type Page } from '@/composables/usePagedList';
import { bump, bumpTopic, watchTopic } from '@/composables/useSketchNotices';

const people = [
  { userId: 'user_tomasz0000000000000', name: 'Tomasz Reyes' },
  { userId: 'user_priya00000000000000', name: 'Priya Vance' },
  { userId: 'user_ana00000000000000000', name: 'Ana' },
  { userId: 'user_anaruiz000000000000', name: 'Ana Ruiz' },
];

describe('mentions', () => {
  it('finds each member mentioned with @Name, in order, once, and ignores names not after @', () => {
    expect(mentionsIn('@Priya Vance and @Tomasz Reyes: see the tail shock. @Priya Vance again', people)).toEqual(['user_priya00000000000000', 'user_tomasz0000000000000']);
    expect(mentionsIn('Tomasz Reyes should look', people)).toEqual([]);
    expect(mentionsIn('@Tomasz Reyesx', people)).toEqual([]);
  });

  it('a longer name wins over a shorter one inside it', () => {
    expect(mentionsIn('@Ana Ruiz, please', people)).toEqual(['user_anaruiz000000000000']);
    expect(mentionsIn('@Ana and @Ana Ruiz', people)).toEqual(['user_ana00000000000000000', 'user_anaruiz000000000000']);
  });

  it('splits a comment into text and mentions for highlighting', () => {
    expect(mentionParts('ok @Priya Vance, thanks', ['Priya Vance'])).toEqual([
      { text: 'ok ', mention: false },
      { text: '@Priya Vance', mention: true },
      { text: ', thanks', mention: false },
    ]);
  });
});

describe('usePagedList', () => {
  function host(load: (q: { limit: number; offset: number }) => Promise<Page<number>>, filter = ref('open')) {
    let api!: ReturnType<typeof usePagedList<number>>;
    const C = defineComponent({
      setup() {
        api = usePagedList(load, [filter], 2);
        return () => h('div');
      },
    });
    const w = mount(C);
    return { w, api: () => api, filter };
  }

  it('asks for the page it shows, goes back to page 1 when a filter changes, and reports errors', async () => {
    const calls: { limit: number; offset: number }[] = [];
    let fail = false;
    const { w, api, filter } = host(async (q) => {
      calls.push(q);
      if (fail) throw new Error('offline');
      return { items: [q.offset + 1, q.offset + 2], total: 5, limit: q.limit, offset: q.offset };
    });
    await flushPromises();
    expect(api().items.value).toEqual([1, 2]);
    expect(api().total.value).toBe(5);
    api().setPage(3);
    await flushPromises();
    expect(calls.at(-1)).toEqual({ limit: 2, offset: 4 });
    filter.value = 'resolved';
    await nextTick();
    await flushPromises();
    expect(api().page.value).toBe(1);
    expect(calls.at(-1)).toEqual({ limit: 2, offset: 0 });
    fail = true;
    await api().refresh();
    expect(api().error.value?.message).toBe('offline');
    w.unmount();
  });

  it('steps back to the last page with items when its page empties', async () => {
    let total = 3;
    const { w, api } = host(async (q) => ({ items: q.offset < total ? [q.offset + 1] : [], total, limit: q.limit, offset: q.offset }));
    await flushPromises();
    api().setPage(2);
    await flushPromises();
    total = 2;
    await api().refresh();
    await flushPromises();
    expect(api().page.value).toBe(1);
    w.unmount();
  });
});

describe('sketch notices', () => {
  it('bumping a topic runs its watchers once; unknown topics from the server are ignored', async () => {
    let pins = 0;
    let activity = 0;
    const stopPins = watchTopic('pins', () => pins++);
    const stopActivity = watchTopic(['pins', 'activity'], () => activity++);
    bump('pins');
    await nextTick();
    bumpTopic('activity');
    await nextTick();
    bumpTopic('nonsense');
    await nextTick();
    expect([pins, activity]).toEqual([1, 2]);
    stopPins();
    stopActivity();
  });
});
