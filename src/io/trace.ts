import type { TraceSkipReason } from './traceSkipLog';

/**
 * A measured trace as the rest of the workbench sees it: an ascending wavenumber axis (cm^-1)
 * and absorbance (−log10 T, dimensionless), stored as columns.
 */
export interface Trace {
  /** Ascending, strictly increasing wavenumbers, cm^-1 (vacuum). */
  wavenumberCm1: Float64Array;
  /** Absorbance, −log10(T), same length as wavenumberCm1. */
  absorbance: Float64Array;
}

/** Detected or user-chosen layout of a trace file. */
export type TraceFormat = 'delimited' | 'jcamp-dx';
/** Abscissa unit as found in the file. */
export type TraceXUnit = 'cm-1' | 'um' | 'nm';
/** Ordinate quantity as found in the file (stored internally always as absorbance). */
export type TraceOrdinate = 'absorbance' | 'transmittance' | 'percent-transmittance';

/** What the importer found and did, for display and for the CLI. */
export interface TraceImportReport {
  fileName: string;
  format: TraceFormat;
  xUnit: TraceXUnit;
  ordinate: TraceOrdinate;
  /** Number of points kept. */
  points: number;
  /** Smallest and largest kept wavenumber, cm^-1. */
  rangeCm1: [number, number];
  /** Rows or values skipped, by 1-based line number of the file. */
  skipped: { count: number; lines: number[] };
  /** True when the file's axis ran from high to low (it is stored ascending). */
  wasDescending: boolean;
  /** Title from the file (JCAMP ##TITLE or similar), untrusted text. */
  title?: string;
  /**
   * Plain-language notes, e.g. "read as delimited text (…)"; the problems of `issues` are among them, in
   * the words of `traceImportWarnings`.
   */
  messages: string[];
  /**
   * Problems found in the data, by kind: skipped rows, a re-ordered axis, clamped values, a flat trace,
   * bytes that are not valid text. Absent in reports saved before it existed. Worded by `traceImportWarnings`.
   */
  issues?: TraceImportIssue[];
  /** Text encoding the file was decoded from, when it came as bytes (`textDecode`). */
  encoding?: string;
  /** Column names from the header line of a delimited file, untrusted text. */
  columnNames?: string[];
  /** 0-based column read as the ordinate (delimited files). */
  yColumn?: number;
  /** Field delimiter found or chosen (delimited files). */
  delimiter?: TraceDelimiter;
  /** Decimal separator found or chosen (delimited files). */
  decimal?: TraceDecimal;
  /** True when the plain-numeric scanner read the data (papaparse was not needed). */
  usedFastPath?: boolean;
}

/** Field delimiter of a delimited trace file; 'whitespace' means runs of spaces and/or tabs. */
export type TraceDelimiter = ',' | '\t' | ';' | 'whitespace';
/** Decimal separator of a delimited trace file. */
export type TraceDecimal = '.' | ',';

/** A refusal with the place at fault. */
export interface TraceImportError {
  /** One-line message naming what is wrong and where. */
  message: string;
  /** 1-based line number at fault, when there is one. */
  line?: number;
  /** Header field or column at fault, when there is one. */
  field?: string;
}

/** Outcome of an import: data and report, or a clear error. Never throws for bad content. */
export type TraceImportOutcome = { ok: true; trace: Trace; report: TraceImportReport } | { ok: false; error: TraceImportError };

/** One kind of problem an import found (and what it did about it); see `traceImportWarnings` for the words. */
export type TraceImportIssue =
  | {
      kind: 'skipped';
      reason: TraceSkipReason;
      /** 'row' for delimited text, 'point' for JCAMP-DX (several points per line). */
      noun: 'row' | 'point';
      count: number;
      /** First 1-based line numbers, ascending (at most 20). */
      lines: number[];
      /** Distinct lines the skips sit on. */
      lineCount: number;
      /** For 'duplicate x': how many of the skipped rows had a y different from the row kept. */
      differentY?: number;
      /** The first offending text and its line (for 'non-numeric'), untrusted text. */
      firstText?: { line: number; text: string };
    }
  | { kind: 'unsorted'; /** Line of the first point out of order. */ firstLine: number }
  | {
      kind: 'clamped';
      count: number;
      /** First 1-based line numbers, ascending (at most 20). */
      lines: number[];
      /** Transmittance fraction the values ≤ 0 were set to. */
      transmittance: number;
    }
  | { kind: 'flat'; points: number; /** The one absorbance every point has. */ absorbance: number }
  | {
      kind: 'undecodable';
      /** Encoding the bytes were read as, e.g. 'UTF-8'. */
      encoding: string;
      /** Byte sequences that are not valid in it (each read as U+FFFD). */
      count: number;
      /** 0-based offset of the first one. */
      firstByte: number;
    };
