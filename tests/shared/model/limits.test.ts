import { describe, expect, it } from 'vitest';
import { reportFileName } from '../../../server/api/reports/service.ts';
import { parseCoordinates } from '../../../shared/model/coordinatesFile.ts';
import { newId } from '../../../shared/model/ids.ts';
import { applyOp } from '../../../shared/model/ops.ts';
import { defaultSketchDocument, MAX_SECTION_VERTICES, sketchDocumentSchema, type Point } from '../../../shared/model/sketch.ts';
import { fileSafeName } from '../../../shared/model/sketchExport.ts';
import { parseSolveInput } from '../../../shared/model/solveInput.ts';
import { presenceMessageSchema } from '../../../shared/protocol/messages.ts';
import { itemAt } from '../../../shared/util/invariant.ts';

/** n vertices of a thin ellipse: a simple polygon of any size. */
const ellipse = (n: number): Point[] => Array.from({ length: n }, (_, i) => [0.5 + 0.5 * Math.cos((2 * Math.PI * i) / n), 0.05 * Math.sin((2 * Math.PI * i) / n)]);

describe('[M2] one vertex cap for every way a section comes in', () => {
  const atCap = ellipse(MAX_SECTION_VERTICES);
  const over = ellipse(MAX_SECTION_VERTICES + 1);
  const says = new RegExp(`at most ${MAX_SECTION_VERTICES}`);

  it('the document schema accepts the cap and refuses one more', () => {
    expect(sketchDocumentSchema.safeParse({ ...defaultSketchDocument(), section: { points: atCap } }).success).toBe(true);
    const r = sketchDocumentSchema.safeParse({ ...defaultSketchDocument(), section: { points: over } });
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => i.message).join(' ')).toMatch(says);
  });

  it('an insert op on a section at the cap is refused', () => {
    const doc = { ...defaultSketchDocument(), section: { points: atCap } };
    const r = applyOp(doc, { type: 'insertVertex', opId: 'op-1', index: 1, at: [0.9999, 0.0001] });
    expect(r.ok).toBe(false);
    expect(r.ok ? '' : r.reason).toMatch(says);
  });

  it('a coordinates file with one point too many is refused', () => {
    const r = parseCoordinates(over.map(([x, y]) => `${x},${y}`).join('\n'));
    expect(r.ok).toBe(false);
    expect(r.ok ? '' : r.issues.map((i) => i.message).join(' ')).toMatch(new RegExp(`at most ${MAX_SECTION_VERTICES} points`));
  });

  it('the batch solve input refuses one point too many', () => {
    const r = parseSolveInput({ section: { points: over }, flow: { mach: 2, alphaDeg: 0 } });
    expect(r.ok).toBe(false);
    expect(r.ok ? '' : r.issues.map((i) => i.message).join(' ')).toMatch(says);
  });

  it('a presence message selects at most the cap', () => {
    const msg = (n: number) => ({ type: 'presence', sketchId: newId('sketch'), cursor: null, selection: Array.from({ length: n }, (_, i) => i) });
    expect(presenceMessageSchema.safeParse(msg(MAX_SECTION_VERTICES)).success).toBe(true);
    expect(presenceMessageSchema.safeParse(msg(MAX_SECTION_VERTICES + 1)).success).toBe(false);
  });
});

describe('[M3] one file-name rule for every download', () => {
  it('fileSafeName keeps letters, digits and dashes, and is never empty', () => {
    expect(fileSafeName('HD-7 Tern fin, root')).toBe('HD-7-Tern-fin-root');
    expect(fileSafeName('../../etc/passwd')).toBe('etcpasswd');
    expect(fileSafeName('###')).toBe('sketch');
    expect(fileSafeName('###', 'study')).toBe('study');
    expect(fileSafeName('x'.repeat(200))).toHaveLength(80);
  });

  it('the PDF report name is the same rule plus its revision', () => {
    for (const title of ['HD-7 Tern fin, root', 'Fin — 5 % wedge', '###', 'a/b\\c"d']) {
      expect(reportFileName(title, 3)).toBe(`${fileSafeName(title)}-r3-report.pdf`);
    }
  });
});

describe('[M1] one id pattern for every edge', () => {
  it('idSchema accepts an id of its kind and names the kind it expected otherwise', async () => {
    const { idSchema } = await import('../../../shared/model/ids.ts');
    expect(idSchema('sketch').safeParse(newId('sketch')).success).toBe(true);
    const wrong = idSchema('sketch').safeParse(newId('team'));
    expect(wrong.success).toBe(false);
    expect(itemAt(wrong.error!.issues, 0).message).toBe('must be a sketch id');
    expect(itemAt(idSchema('invite', 'invitation').safeParse('invite_x').error!.issues, 0).message).toBe('must be an invitation id');
  });
});
