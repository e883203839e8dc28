import type { SketchCase } from '@shared/model/sketch';
import type { StudyDefinition, StudyResults } from '@shared/model/study';

/** Messages between a page and the study worker; `id` pairs answers with their run. */
export type StudyRequest =
  | { type: 'run'; id: number; document: SketchCase; definition: StudyDefinition }
  | { type: 'cancel'; id: number };

export type StudyResponse =
  | { type: 'progress'; id: number; done: number; total: number }
  | { type: 'done'; id: number; results: StudyResults; elapsedMs: number }
  | { type: 'cancelled'; id: number; done: number; total: number }
  | { type: 'failed'; id: number; message: string };
