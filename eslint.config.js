// ESLint (flat config). Two jobs: catch mistakes (ESLint's, typescript-eslint's and Vue's
// recommended rules) and hold the layer rules of DEVELOPERS.md ("Layers, checked by the linter"),
// so a rule only a document states cannot drift again. `npm run lint`; `npm test` counts it as a
// suite. tests/tooling/lint.test.ts lints a fixture that breaks each layer rule.
import { builtinModules } from 'node:module';
import js from '@eslint/js';
import { defineConfig } from 'eslint/config';
import pluginVue from 'eslint-plugin-vue';
import globals from 'globals';
import tseslint from 'typescript-eslint';

// ── Layer rules, as groups of forbidden imports ─────────────────────────────────────────────

/** shared/: pure TypeScript used by both sides; it may import zod and itself, nothing else. */
const SHARED = {
  patterns: [
    { regex: '^(\\.\\./)+(src|server)(/|$)|^@/', message: 'shared/ imports nothing from src/ or server/ (it is used by both).' },
    { regex: `^node:|^(${builtinModules.map((m) => m.replace(/[/.]/g, '\\$&')).join('|')})(/|$)`, message: 'shared/ runs in the browser too: no Node modules.' },
    {
      regex: '^(vue|vue-router|pinia|@vue/.*|konva|vue-konva|ant-design-vue|@ant-design/.*|echarts|vue-echarts|socket\\.io|socket\\.io-client|express|pg|drizzle-orm)(/|$)',
      message: 'shared/ is plain TypeScript: no Vue, Konva, UI, socket, HTTP or database packages.',
    },
  ],
};

/** src/ (the client) never imports the server. */
const CLIENT = {
  patterns: [{ regex: '^(\\.\\./)+server(/|$)', message: 'src/ never imports server/: share code through shared/.' }],
};

/** Pinia stores hold state and actions; drawing and the socket live elsewhere. */
const STORES = {
  patterns: [
    { regex: '^(konva|vue-konva)(/|$)', message: 'Stores never import Konva: renderers turn store state into Konva nodes.' },
    {
      regex: '^socket\\.io-client(/|$)|(^|/)useSketchChannel(\\.ts)?$',
      message: 'Stores never import the socket: useSketchChannel owns it and feeds the stores.',
    },
  ],
};

/** server/ never imports the client. */
const SERVER = {
  patterns: [{ regex: '^(\\.\\./)+src(/|$)|^@/', message: 'server/ never imports src/: share code through shared/.' }],
};

/** Only repositories (and server/db, the composition root) talk to the database. */
const DATA_ACCESS = {
  patterns: [
    {
      regex: '^(drizzle-orm|pg)(/|$)|(^|/)db/schema(\\.ts)?$',
      message: 'Only repositories (server/**/repository.ts) and server/db import drizzle-orm, pg or db/schema: ask a repository.',
    },
  ],
};

/** Routers validate and call their service; they never reach past it. */
const ROUTERS = {
  patterns: [{ regex: '(^|/)repository(\\.ts)?$', message: 'A router calls its service; only services use repositories.' }],
};

/** Services take parsed values, never req/res. */
const SERVICES = {
  patterns: [{ regex: '^express(/|$)', message: 'Services know nothing of HTTP: the router passes parsed values in.' }],
};

const restrict = (...groups) => ({
  'no-restricted-imports': ['error', { patterns: groups.flatMap((g) => g.patterns) }],
});

/** A transaction is "do X atomically", which a repository offers; services do not open one. */
const TRANSACTIONS = {
  'no-restricted-syntax': [
    'error',
    {
      selector: "CallExpression[callee.property.name='transaction']",
      message: 'Transactions belong in repositories: add a repository function that does the whole change atomically.',
    },
  ],
};

/** Globals that exist only in a browser or only in Node; shared/ runs in both. */
const SHARED_FORBIDDEN_GLOBALS = [
  'window', 'document', 'navigator', 'location', 'localStorage', 'sessionStorage', 'indexedDB', 'self',
  'requestAnimationFrame', 'cancelAnimationFrame', 'getComputedStyle', 'HTMLElement', 'HTMLCanvasElement',
  'process', 'Buffer', '__dirname', '__filename', 'require', 'module', 'global', 'setImmediate',
].map((name) => ({ name, message: 'shared/ runs in the browser and in Node: pass what you need in as a parameter.' }));

// ── Temporary exceptions ─────────────────────────────────────────────────────────────────────
// Files that break a layer rule today and are being refactored by their owners. One entry per
// file; each lists the rule groups that still hold for it. Remove the entry in the commit that
// makes the file comply (lint then keeps it that way). Do not add new entries.
const TEMPORARY_EXCEPTIONS = [
  // Being moved to a repository, issue #16 (walkthrough, sketch and user queries).
  { files: ['server/realtime/index.ts'], rules: { ...restrict(SERVER), 'no-useless-assignment': 'off' } },
  // Being moved to a repository, issue #16 (the edit log and its transaction).
  { files: ['server/realtime/editLog.ts'], rules: { ...restrict(SERVER), 'no-restricted-syntax': 'off' } },
];

// ── The config ───────────────────────────────────────────────────────────────────────────────

/** eslint-plugin-vue's layout rules: formatting is not checked (the stack has no formatter). */
const vueLayoutOff = Object.fromEntries(
  Object.entries(pluginVue.rules)
    .filter(([, rule]) => rule.meta?.type === 'layout')
    .map(([name]) => [`vue/${name}`, 'off']),
);

export default defineConfig(
  { ignores: ['**/node_modules/', 'dist/', 'coverage/', '.data/', 'drizzle/', 'tests/e2e/artifacts/', 'tests/fixtures/lint/'] },
  js.configs.recommended,
  tseslint.configs.recommended,
  pluginVue.configs['flat/recommended'],
  {
    files: ['**/*.vue'],
    languageOptions: { parserOptions: { parser: tseslint.parser, extraFileExtensions: ['.vue'] } },
  },
  {
    languageOptions: { ecmaVersion: 2023, sourceType: 'module' },
    linterOptions: { reportUnusedDisableDirectives: 'error' },
    rules: {
      ...vueLayoutOff,
      // `_name` marks a parameter or binding kept on purpose (Express's 4-argument error
      // handler, a destructured field being dropped).
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrorsIgnorePattern: '^_', ignoreRestSiblings: true },
      ],
    },
  },
  { files: ['src/**/*.{ts,vue}'], languageOptions: { globals: { ...globals.browser } } },
  { files: ['src/workers/**/*.ts'], languageOptions: { globals: { ...globals.worker } } },
  {
    files: ['server/**/*.{ts,mjs}', 'tests/**/*.ts', '*.{js,ts}'],
    languageOptions: { globals: { ...globals.node } },
  },

  // Layer rules. For one rule ESLint uses the last matching block, so each block lists every
  // group that applies to its files.
  { files: ['shared/**/*.ts'], rules: { ...restrict(SHARED), 'no-restricted-globals': ['error', ...SHARED_FORBIDDEN_GLOBALS] } },
  { files: ['src/**/*.{ts,vue}'], rules: restrict(CLIENT) },
  { files: ['src/stores/**/*.ts'], rules: restrict(CLIENT, STORES) },
  { files: ['server/**/*.ts'], rules: { ...restrict(SERVER, DATA_ACCESS), ...TRANSACTIONS } },
  { files: ['server/api/*/router.ts'], rules: restrict(SERVER, DATA_ACCESS, ROUTERS) },
  { files: ['server/api/*/service.ts'], rules: restrict(SERVER, DATA_ACCESS, SERVICES) },
  { files: ['server/**/repository.ts', 'server/db/**/*.ts'], rules: { ...restrict(SERVER), 'no-restricted-syntax': 'off' } },
  ...TEMPORARY_EXCEPTIONS,
);
