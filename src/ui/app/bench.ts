/**
 * What the views may read and ask of the workbench. Views are functions of this interface;
 * they never reach the worker, the canvas or storage directly.
 */
import type { Calibration } from '../../digitize/calibration.ts';
import type { SheetKind as LoadedKind } from '../../digitize/sheet.ts';
import type { CurveSet, Quantity } from '../../model/curveset.ts';
import type { Takeoff } from '../../model/takeoff.ts';
import type { FitLine } from '../canvas/overlay.ts';
import type { Store, Step } from '../store/store.ts';
import type { TraceResidual } from './review.ts';
import type { AnchorProposal } from '../worker/protocol.ts';
import type { DutyForm, DutyOutcome } from '../views/dutyPanel.ts';
import type { OpenQuestion } from './detection.ts';

export interface LoadedSheet {
  name: string;
  mime: string;
  kind: 'pdf' | 'image';
  pages: { width: number; height: number }[];
  /** Small pictures of the pages for the page picker, as data URLs. */
  thumbnails: Map<number, string>;
  /** What the chosen page turned out to be, once read. */
  loadedKind: LoadedKind | null;
  /** Text items found on the chosen page (0 for scans). */
  texts: number;
}

export type CalibrationState = { ok: true; calibration: Calibration } | { ok: false; reason: string };

export interface Derived {
  calibrations: ReadonlyMap<string, CalibrationState>;
  /** The take-off file the review was computed from. */
  takeoff: Takeoff | null;
  curveSet: CurveSet | null;
  /** Why there is no curve set, when there is none. */
  problem: string | null;
  /** What the take-off file leaves out for now (panels without values, …). */
  omitted: readonly string[];
  residuals: ReadonlyMap<string, TraceResidual>;
  fits: readonly FitLine[];
  /** Trace id → indexes of the curve-set members its points went into, as the replay made the link. */
  traceMembers: ReadonlyMap<string, readonly number[]>;
  /** True while the worker is fitting. */
  computing: boolean;
}

export interface Bench {
  readonly store: Store;
  readonly sheet: LoadedSheet | null;
  readonly derived: Derived;
  /** What the next click on the sheet does. */
  nextClick(): string;
  /** The value under the cursor, e.g. "Q 120 m³/h · H 45.2 m (head panel)". */
  readonly readout: string;
  openFiles(files: readonly File[]): void;
  choosePage(page: number): void;
  goto(step: Step): void;
  startFrame(plots: Quantity): void;
  selectPanel(id: string): void;
  /** Highlights a trace on the sheet and brings it into view. */
  showTrace(id: string | null): void;
  retrace(id: string): void;
  download(what: 'takeoff' | 'curveset' | 'csv'): void;
  /** Saves to the library: a new revision of this document's entry, or with `asNew` a new entry. */
  saveToLibrary(asNew?: boolean): void;
  zoom(action: 'in' | 'out' | 'fit'): void;
  /** The duty check of the review: what was typed and what it gave. */
  readonly duty: { form: DutyForm; outcome: DutyOutcome };
  setDuty(patch: Partial<DutyForm>): void;
  /** Makes the selection record (study on the sheet, PDF) and downloads it. */
  downloadRecord(paper: 'a4' | 'letter'): void;
  /** Whether the study is drawn on the sheet, and switching it. */
  readonly studyOnSheet: boolean;
  showStudyOnSheet(on: boolean): void;
  /** Anchors proposed from the sheet's text for a panel, if any. */
  proposalFor(panelId: string): AnchorProposal | null;
  useProposal(panelId: string): void;
  /** The automatic take-off: whether it can run on this page, whether it runs, and the question it asks now. */
  readonly detect: { available: boolean; running: boolean; question: OpenQuestion | null };
  /** Finds the panels and curves of a vector page and puts them into the document (one undoable edit). */
  findPanelsAndCurves(): void;
  /** Answers the question on screen; the labelling runs again with the answer. */
  answerQuestion(text: string): void;
  skipQuestion(): void;
  readonly zoomPercent: number;
}
