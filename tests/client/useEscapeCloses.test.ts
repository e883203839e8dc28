import { describe, expect, it } from 'vitest';
import { defineComponent, h, nextTick, ref } from 'vue';
import { mount } from '@vue/test-utils';
import { useEscapeCloses } from '@/composables/useEscapeCloses';

describe('useEscapeCloses (popup lists: Export, Outcome)', () => {
  it('Escape closes an open list, other keys do not, and nothing listens once it is closed or gone', async () => {
    const open = ref(false);
    const w = mount(defineComponent({ setup: () => (useEscapeCloses(open), () => h('div')) }));
    const press = (key: string) => window.dispatchEvent(new KeyboardEvent('keydown', { key }));

    open.value = true;
    await nextTick();
    press('Enter');
    expect(open.value).toBe(true);
    press('Escape');
    expect(open.value).toBe(false);

    // Closed: Escape does not touch it (a list opened again later starts listening again).
    await nextTick();
    open.value = true;
    await nextTick();
    press('Escape');
    expect(open.value).toBe(false);

    // Unmounted while open: its listener is gone.
    open.value = true;
    await nextTick();
    w.unmount();
    press('Escape');
    expect(open.value).toBe(true);
  });
});
