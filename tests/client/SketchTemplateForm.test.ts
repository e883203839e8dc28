import { describe, expect, it } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import SketchTemplateForm from '@/components/SketchTemplateForm.vue';
import { generateSection } from '@shared/model/templates';

type Wrapper = ReturnType<typeof mount>;

/** The number input of a template parameter (the test id sits on it or on its wrapper). */
function paramInput(wrapper: Wrapper, key: string) {
  const el = wrapper.get(`[data-testid="template-param-${key}"]`);
  return el.element.tagName === 'INPUT' ? el : el.get('input');
}

async function setParam(wrapper: Wrapper, key: string, value: string) {
  const input = paramInput(wrapper, key);
  await input.setValue(value);
  await input.trigger('blur');
  await flushPromises();
}

describe('SketchTemplateForm', () => {
  it('starts on the double wedge with its default parameters and an outline', () => {
    const wrapper = mount(SketchTemplateForm);
    expect(wrapper.get('[data-testid="template-doubleWedge"]').attributes('aria-checked')).toBe('true');
    // The input shows as many decimals as its step (0.5 → one).
    expect(Number((paramInput(wrapper, 'thicknessPercent').element as HTMLInputElement).value)).toBe(5);
    expect(Number((paramInput(wrapper, 'ridgePercent').element as HTMLInputElement).value)).toBe(50);
    expect(wrapper.get('[data-testid="template-preview"]').attributes('points')?.split(' ')).toHaveLength(4);
    expect(wrapper.text()).toContain('4 vertices');
  });

  it('switching template shows that template’s parameters', async () => {
    const wrapper = mount(SketchTemplateForm);
    await wrapper.get('[data-testid="template-biconvex"]').trigger('click');
    expect(wrapper.find('[data-testid="template-param-facetsPerSide"]').exists()).toBe(true);
    expect(wrapper.find('[data-testid="template-param-ridgePercent"]').exists()).toBe(false);
    expect(wrapper.text()).toContain('16 vertices');
  });

  it('submits the generated section, its parameters and a title', async () => {
    const wrapper = mount(SketchTemplateForm);
    await wrapper.get('[data-testid="template-hexagonal"]').trigger('click');
    await setParam(wrapper, 'thicknessPercent', '6');
    await wrapper.get('[data-testid="template-submit"]').trigger('click');
    const [payload] = wrapper.emitted('submit')![0] as [{ templateId: string; params: Record<string, number>; points: unknown; title: string }];
    expect(payload.templateId).toBe('hexagonal');
    expect(payload.params).toEqual({ thicknessPercent: 6, flatPercent: 50 });
    const expected = generateSection('hexagonal', { thicknessPercent: 6, flatPercent: 50 });
    expect(expected.ok && payload.points).toEqual(expected.ok ? expected.points : null);
    expect(payload.title).toBe('Hexagonal — thickness ratio 6 % c, flat length 50 % c');
  });

  it('an out-of-range or empty parameter shows its message and blocks submitting', async () => {
    const wrapper = mount(SketchTemplateForm);
    // The input clamps typed values to its range; an empty field is the way to an invalid one.
    await setParam(wrapper, 'thicknessPercent', '');
    expect(wrapper.get('[data-testid="template-error-thicknessPercent"]').text()).toBe('Thickness ratio needs a number.');
    expect(wrapper.get('[data-testid="template-submit"]').attributes('disabled')).toBeDefined();
    expect(wrapper.find('[data-testid="template-preview"]').exists()).toBe(false);
    const changes = wrapper.emitted('change')!;
    expect(changes.at(-1)).toEqual([{ valid: false, title: 'Double wedge' }]);
    await wrapper.get('[data-testid="template-submit"]').trigger('click');
    expect(wrapper.emitted('submit')).toBeUndefined();
  });
});
