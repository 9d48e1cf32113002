/** Shapes shared by the template parser, printer, tree operations and revision diffs. */

export interface ThemeNode {
  /** Stable across renames and moves; '' in a freshly parsed outline (see assignIds). */
  id: string;
  name: string;
  /** Defined before coding, from the brief or theory. */
  apriori: boolean;
  /**
   * An integrative theme: it runs across the other themes rather than sitting under one, and is
   * coded alongside any of them. Top level only; absent in trees stored before it existed.
   */
  integrative?: boolean;
  /** '' when absent. */
  definition: string;
  include: string;
  exclude: string;
  /** Seed terms that hint at the theme before any passage is coded. */
  seeds: string[];
  children: ThemeNode[];
  /** 1-based source line when parsed from an outline. */
  line?: number;
}

export interface Template {
  roots: ThemeNode[];
}

/** One step between two revisions; paths are written with " > " between levels. */
export type Change =
  | { kind: 'added'; id: string; path: string }
  | { kind: 'removed'; id: string; path: string } // removed from the outline = retired
  | { kind: 'renamed'; id: string; from: string; to: string }
  | { kind: 'moved'; id: string; from: string; to: string }
  | { kind: 'merged'; id: string; into: string; from: string; to: string }
  | { kind: 'split'; id: string; path: string; into: string[] }
  | { kind: 'retired'; id: string; path: string }
  | { kind: 'revived'; id: string; path: string } // a retired theme's path came back: its codings return
  | { kind: 'edited'; id: string; path: string; fields: string[] };

/** What every tree operation returns: a new template (the input is never touched) and its changes. */
export interface Revised {
  template: Template;
  changes: Change[];
}

/** A problem or remark about one line of an outline (line absent when it concerns the whole file). */
export interface Diagnostic {
  file: string;
  line?: number;
  message: string;
  /** "file:line: message", ready to print. */
  text: string;
}

export interface ParseResult {
  /** Best-effort tree even when there are errors; do not record it as a revision then. */
  template: Template;
  errors: Diagnostic[];
  warnings: Diagnostic[];
}

/** Fields compared for an 'edited' change. */
export type EditableField = 'definition' | 'include' | 'exclude' | 'seeds' | 'apriori' | 'integrative';
