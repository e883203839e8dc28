import { onBeforeUnmount, ref, type Ref } from 'vue';

/** Screens this narrow (CSS pixels) get the read-only sketch view and the compact sketches table. */
export const PHONE_MAX_WIDTH_PX = 600;
const QUERY = `(max-width: ${PHONE_MAX_WIDTH_PX}px)`;

export function isPhoneWidth(): boolean {
  return typeof window !== 'undefined' && typeof window.matchMedia === 'function' && window.matchMedia(QUERY).matches;
}

/** Whether the screen is phone-width now, following rotation and window resizes. */
export function usePhoneWidth(): Ref<boolean> {
  const phone = ref(isPhoneWidth());
  if (typeof window === 'undefined' || typeof window.matchMedia !== 'function') return phone;
  const media = window.matchMedia(QUERY);
  const onChange = () => (phone.value = media.matches);
  media.addEventListener?.('change', onChange);
  onBeforeUnmount(() => media.removeEventListener?.('change', onChange));
  return phone;
}
