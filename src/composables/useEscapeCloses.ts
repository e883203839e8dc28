import { onBeforeUnmount, watch, type Ref } from 'vue';

/**
 * Escape closes a popup list (the Export and Outcome lists) while it is open, wherever the focus
 * is: the list opens from a button and the focus stays on the button.
 */
export function useEscapeCloses(open: Ref<boolean>): void {
  const onKey = (e: KeyboardEvent) => {
    if (e.key === 'Escape') open.value = false;
  };
  const stop = () => window.removeEventListener('keydown', onKey);
  watch(open, (isOpen) => (isOpen ? window.addEventListener('keydown', onKey) : stop()));
  onBeforeUnmount(stop);
}
