import { REVIEW_STATE_LABEL, type Approval, type ReviewHistoryEntry, type ReviewState } from '../../../shared/model/review.ts';
import { ACCENT, INK, INK_SOFT } from './pdfCharts.ts';
import { line, paragraph } from './pdfText.ts';

/** The review part of a report: what people read, the approval in force and the last request for changes. */
export interface ReportReview {
  state: ReviewState;
  /** The approval in force [A1] (null when not approved). */
  approval: Approval | null;
  /** The newest request for changes, shown while the status says so. */
  changesRequested: ReviewHistoryEntry | null;
}

const utc = (iso: string) => `${iso.replace('T', ' ').slice(0, 16)} UTC`;

/**
 * The sentences of the approval record [A6]: who approved which revision and when, and whether
 * the sketch has changed since — or "Not approved", with the status and any request for changes.
 * `revision` is the revision the report shows.
 */
export function approvalSentences(review: ReportReview | undefined, revision: number): { headline: string; lines: string[] } {
  const a = review?.approval;
  if (a) {
    const who = `by ${a.byName ?? 'a former member'} on ${utc(a.at)}`;
    const lines = [`Approved: revision ${a.revision}, ${who}.`];
    if (a.note) lines.push(`Approval note: “${a.note}”`);
    if (revision > a.revision) {
      lines.push(`Changed since approval: this report shows revision ${revision}; revision ${a.revision} is the one approved. Not approved as shown.`);
      return { headline: REVIEW_STATE_LABEL.changed_since_approval, lines };
    }
    return { headline: `${REVIEW_STATE_LABEL.approved} (revision ${a.revision})`, lines };
  }
  const state = review?.state ?? 'draft';
  const lines = [`Review status: ${REVIEW_STATE_LABEL[state].toLowerCase()}.`];
  const c = review?.changesRequested;
  if (state === 'changes_requested' && c) lines.push(`Changes requested at revision ${c.revision} by ${c.byName ?? 'a former member'} on ${utc(c.at)}: “${c.note}”`);
  return { headline: 'Not approved', lines };
}

/**
 * Draws the approval record below the title block: a bold headline and its sentences, within
 * `width` from (x, y). Returns the y after it. Kept apart from the rest of the report.
 */
export function drawApprovalRecord(doc: PDFKit.PDFDocument, at: { x: number; y: number; width: number }, review: ReportReview | undefined, revision: number): number {
  const { headline, lines } = approvalSentences(review, revision);
  const label = 'Review  ';
  const lw = line(doc, label, at.x, at.y, { size: 9, weight: 'bold', color: ACCENT });
  line(doc, headline, at.x + lw, at.y, { size: 9, weight: 'bold', color: INK });
  let y = at.y + 13;
  for (const text of lines) y += paragraph(doc, text, at.x, y, at.width, { size: 8.5, color: INK_SOFT });
  return y + 8;
}
