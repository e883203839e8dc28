import type { SketchAnalysis } from '../../../shared/flight/analyseSketch.ts';
import type { DesignPointsAnalysis } from '../../../shared/flight/storedAnalysis.ts';
import type { UnitSystem } from '../../../shared/flight/units.ts';
import type { SketchDocument } from '../../../shared/model/sketch.ts';
import type { StudyDefinition, StudyResults } from '../../../shared/model/study.ts';
import type { ReportReview } from './pdfApproval.ts';

/** Everything one PDF report shows; built by the service, drawn by renderReport (no database). */
export interface ReportData {
  title: string;
  teamName: string | null;
  /** The sketch revision the analysis belongs to. */
  revision: number;
  generatedAt: Date;
  generatedBy: string;
  units: UnitSystem;
  document: SketchDocument;
  /** The selected design point's analysis (section, wave map, coefficients, loads). */
  analysis: SketchAnalysis;
  /** Every design point's analysis, in the document's order. */
  points: DesignPointsAnalysis;
  study: ReportStudy | null;
  /** The approval record [A6] (pdfApproval.ts); absent (benches, drawing tests) reads "Not approved". */
  review?: ReportReview;
}

export interface ReportStudy {
  id: string;
  name: string;
  /** The sketch revision the study was computed on (may be older than the report's). */
  revision: number;
  definition: StudyDefinition;
  results: StudyResults;
  createdByName: string | null;
  createdAt: string;
}
