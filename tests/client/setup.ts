/**
 * Set-up for the client project (happy-dom). ant-design-vue's responsive helpers call
 * window.matchMedia; a fixed stub (nothing matches) keeps component tests deterministic.
 */
Object.defineProperty(window, 'matchMedia', {
  writable: true,
  configurable: true,
  value: (query: string): MediaQueryList =>
    ({
      matches: false,
      media: query,
      onchange: null,
      addListener: () => {},
      removeListener: () => {},
      addEventListener: () => {},
      removeEventListener: () => {},
      dispatchEvent: () => false,
    }) as MediaQueryList,
});
