import type { ThemeConfig } from 'ant-design-vue/es/config-provider/context';

/**
 * Shockwright's one theme: a deep teal accent, square-ish corners and a compact density that
 * fits tables of coefficients. Everything in ant-design-vue reads these tokens.
 */
export const shockwrightTheme: ThemeConfig = {
  token: {
    colorPrimary: '#0b6e69',
    colorInfo: '#0b6e69',
    colorWarning: '#c27400',
    colorError: '#b3261e',
    colorSuccess: '#2e7d32',
    colorTextBase: '#14212b',
    colorBgLayout: '#f4f6f5',
    borderRadius: 3,
    fontFamily: "'Work Sans', system-ui, sans-serif",
    fontSize: 13,
    controlHeight: 30,
  },
};
