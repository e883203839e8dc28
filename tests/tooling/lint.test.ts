import path from 'node:path';
import { ESLint } from 'eslint';
import { beforeAll, describe, expect, it } from 'vitest';

const ROOT = path.resolve(import.meta.dirname, '../..');

/**
 * The layer rules of DEVELOPERS.md ("Layers, checked by the linter") fire: each case lints a few
 * lines as if they were a file at `file` in the repository, with the repository's own config.
 */
const BREAKS: { rule: string; file: string; code: string; says: RegExp }[] = [
  { rule: 'shared → src', file: 'shared/model/fixture.ts', code: "import { api } from '../../src/api/client.ts';", says: /shared\/ imports nothing from src\/ or server\// },
  { rule: 'shared → src (alias)', file: 'shared/model/fixture.ts', code: "import { api } from '@/api/client';", says: /shared\/ imports nothing from src\/ or server\// },
  { rule: 'shared → server', file: 'shared/solver/fixture.ts', code: "import { HttpError } from '../../server/http/errors.ts';", says: /shared\/ imports nothing from src\/ or server\// },
  { rule: 'shared → Node', file: 'shared/model/fixture.ts', code: "import { readFileSync } from 'node:fs';", says: /no Node modules/ },
  { rule: 'shared → Node (bare)', file: 'shared/model/fixture.ts', code: "import path from 'path';", says: /no Node modules/ },
  { rule: 'shared → Vue', file: 'shared/protocol/fixture.ts', code: "import { ref } from 'vue';", says: /no Vue, Konva/ },
  { rule: 'shared → Konva', file: 'shared/model/fixture.ts', code: "import Konva from 'konva';", says: /no Vue, Konva/ },
  { rule: 'shared → DOM global', file: 'shared/model/fixture.ts', code: 'export const w = window.innerWidth;', says: /runs in the browser and in Node/ },
  { rule: 'shared → Node global', file: 'shared/model/fixture.ts', code: 'export const e = process.env.X;', says: /runs in the browser and in Node/ },
  { rule: 'src → server', file: 'src/views/fixture.ts', code: "import { createApp } from '../../server/app.ts';", says: /src\/ never imports server\// },
  { rule: 'src → server (in a .vue file)', file: 'src/components/Fixture.vue', code: "<script setup lang=\"ts\">\nimport { createApp } from '../../server/app.ts';\ncreateApp;\n</script>\n<template><div /></template>\n", says: /src\/ never imports server\// },
  { rule: 'server → src', file: 'server/api/sketches/fixture.ts', code: "import { api } from '../../../src/api/client.ts';", says: /server\/ never imports src\// },
  { rule: 'service → drizzle-orm', file: 'server/api/sketches/service.ts', code: "import { eq } from 'drizzle-orm';", says: /Only repositories .* import drizzle-orm, pg or db\/schema/ },
  { rule: 'router → pg', file: 'server/api/pins/router.ts', code: "import pg from 'pg';", says: /Only repositories .* import drizzle-orm, pg or db\/schema/ },
  { rule: 'realtime → db/schema', file: 'server/realtime/fixture.ts', code: "import { sketches } from '../db/schema.ts';", says: /Only repositories .* import drizzle-orm, pg or db\/schema/ },
  { rule: 'anything → drizzle-orm/pg-core', file: 'server/mail/fixture.ts', code: "import { text } from 'drizzle-orm/pg-core';", says: /Only repositories/ },
  { rule: 'service opens a transaction', file: 'server/api/pins/service.ts', code: 'declare const db: { transaction(f: () => void): void };\ndb.transaction(() => {});', says: /Transactions belong in repositories/ },
  { rule: 'router → repository', file: 'server/api/pins/router.ts', code: "import { listPins } from './repository.ts';", says: /A router calls its service/ },
  { rule: 'service → express', file: 'server/api/pins/service.ts', code: "import type { Request } from 'express';", says: /Services know nothing of HTTP/ },
  { rule: 'store → Konva', file: 'src/stores/fixture.ts', code: "import Konva from 'konva';", says: /Stores never import Konva/ },
  { rule: 'store → vue-konva', file: 'src/stores/fixture.ts', code: "import { Stage } from 'vue-konva';", says: /Stores never import Konva/ },
  { rule: 'store → socket.io-client', file: 'src/stores/fixture.ts', code: "import { io } from 'socket.io-client';", says: /Stores never import the socket/ },
  { rule: 'store → the socket owner', file: 'src/stores/fixture.ts', code: "import { useSketchChannel } from '@/composables/useSketchChannel';", says: /Stores never import the socket/ },
  { rule: 'store → server (client rule still holds)', file: 'src/stores/fixture.ts', code: "import { x } from '../../server/x.ts';", says: /src\/ never imports server\// },
];

/** What the rules allow: the same kind of import where it belongs. */
const ALLOWED: { what: string; file: string; code: string }[] = [
  { what: 'a repository imports drizzle-orm and db/schema', file: 'server/api/pins/repository.ts', code: "import { eq } from 'drizzle-orm';\nimport { pins } from '../../db/schema.ts';\nexport { eq, pins };" },
  { what: 'a nested repository imports pg', file: 'server/realtime/repository.ts', code: "import pg from 'pg';\nexport { pg };" },
  { what: 'server/db imports pg and drizzle-orm', file: 'server/db/fixture.ts', code: "import pg from 'pg';\nimport { sql } from 'drizzle-orm';\nexport { pg, sql };" },
  { what: 'a repository opens a transaction', file: 'server/api/pins/repository.ts', code: 'declare const db: { transaction(f: () => void): void };\ndb.transaction(() => {});' },
  { what: 'shared imports zod and shared', file: 'shared/model/fixture.ts', code: "import { z } from 'zod';\nimport { newId } from './ids.ts';\nexport { z, newId };" },
  { what: 'a store imports shared and the API wrapper', file: 'src/stores/fixture.ts', code: "import { api } from '@/api/client';\nimport { newId } from '@shared/model/ids';\nexport { api, newId };" },
  { what: 'a component imports Konva', file: 'src/canvas/fixture.ts', code: "import Konva from 'konva';\nexport { Konva };" },
  { what: 'a service imports its repository', file: 'server/api/pins/service.ts', code: "import { listPins } from './repository.ts';\nexport { listPins };" },
];

describe('ESLint layer rules (eslint.config.js)', () => {
  let eslint: ESLint;
  beforeAll(() => {
    eslint = new ESLint({ cwd: ROOT });
  });

  const lint = async (file: string, code: string) => {
    const [result] = await eslint.lintText(code, { filePath: path.join(ROOT, file) });
    return result!.messages;
  };

  it.each(BREAKS)('refuses $rule ($file)', async ({ file, code, says }) => {
    const messages = await lint(file, code);
    const layer = messages.filter((m) => m.ruleId === 'no-restricted-imports' || m.ruleId === 'no-restricted-globals' || m.ruleId === 'no-restricted-syntax');
    expect(layer.map((m) => m.message).join('\n')).toMatch(says);
    expect(layer.length).toBeGreaterThan(0);
    expect(layer.every((m) => m.severity === 2)).toBe(true);
  });

  it.each(ALLOWED)('allows: $what', async ({ file, code }) => {
    const messages = await lint(file, code);
    expect(messages.filter((m) => m.severity === 2)).toEqual([]);
  });
});
