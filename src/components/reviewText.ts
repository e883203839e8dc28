import type { Approval, ReviewOutcome, SnapshotSummary } from '@shared/model/review';

/** Words the review components share. The review states' words are shared with the report: `REVIEW_STATE_LABEL`. */
export const REVIEW_OUTCOME_LABEL: Record<ReviewOutcome, string> = {
  approved: 'Approved',
  changes_requested: 'Changes requested',
  reset: 'Reset to draft',
};

export const SNAPSHOT_KIND_LABEL: Record<SnapshotSummary['kind'], string> = {
  manual: 'saved',
  before_restore: 'automatic, before a restore',
  before_import: 'automatic, before an import',
};

const when = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });

/** A timestamp as people read it ("12 Mar 2026, 14:05" in the reader's locale). */
export function formatWhen(iso: string): string {
  return when.format(new Date(iso));
}

/**
 * The approval in force in one sentence [A1][A2]: "Approved revision 12 by Priya Reviewer,
 * 3 Dec 2026, 07:10" and, once the sketch moved past it, what it is at now.
 */
export function approvalSentence(approval: Approval, revision: number): string {
  const base = `Approved revision ${approval.revision} by ${approval.byName ?? 'a former member'}, ${formatWhen(approval.at)}`;
  return revision > approval.revision ? `${base}; changed since (now revision ${revision}).` : `${base}.`;
}
