import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import SketchToolbar from '@/components/SketchToolbar.vue';

const LONG = 'Tern canard — faceted biconvex, 12 facets a side, hinge at 70 % chord';

function mountToolbar(canEdit: boolean) {
  return mount(SketchToolbar, { props: { title: LONG, saveState: 'saved', saveError: null, revision: 3, canEdit, hasResult: true }, global: { stubs: { RouterLink: true } } });
}

describe('SketchToolbar', () => {
  it('the title, cut with an ellipsis when the header is full, is whole in its tooltip, for editors (with how to rename) and readers', () => {
    expect(mountToolbar(true).get('[data-testid="sketch-title"]').attributes('title')).toBe(`${LONG} — click to rename`);
    expect(mountToolbar(false).get('[data-testid="sketch-title"]').attributes('title')).toBe(LONG);
  });
});
