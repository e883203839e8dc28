import type { ReviewStatus, SnapshotSummary } from '@shared/model/review';

/** Words the review components share. */
export const REVIEW_STATUS_LABEL: Record<ReviewStatus, string> = {
  draft: 'Draft',
  in_review: 'In review',
  approved: 'Approved',
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
