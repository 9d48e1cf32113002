/** Everything a report or codebook shows, gathered from the study once; renderers only format it. */

export interface ReportTheme {
  id: string;
  number: string; // "1.2.1"
  name: string;
  path: string;
  depth: number;
  apriori: boolean;
  /** An integrative theme, or under one: listed apart from the hierarchy. */
  integrative?: boolean;
  definition: string;
  include: string;
  exclude: string;
  seeds: string[];
  /** Passages coded to this theme itself / to it or any sub-theme. */
  direct: number;
  total: number;
  /** Memos on this theme, oldest first. */
  memos?: ReportMemo[];
  /** The chosen quotes (src/report/quotes.ts): pinned ones first, then closest to the theme's centre. */
  quotes: ReportQuote[];
}

export interface ReportQuote {
  passageId: string;
  transcript: string;
  speaker: string | null;
  time: string;
  text: string;
  /** Pinned by a researcher (trellis quote pin). */
  pinned?: boolean;
}

export interface ReportMemo {
  id: number;
  at: string;
  author: string;
  kind: 'study' | 'theme' | 'transcript' | 'passage';
  /** Theme id, transcript name or passage id; null for the study. */
  target: string | null;
  /** The theme's current path, the transcript name or passage id, or "the study". */
  label: string;
  text: string;
}

export interface ReportRevision {
  rev: number;
  at: string;
  author: string;
  action: string;
  reason: string | null;
  changes: string[]; // readable lines: "renamed A -> B"
}

export interface AcceptanceRow {
  label: string; // a theme path, a day, a band
  decided: number;
  accepted: number;
  rate: number | null;
}

export interface CalibrationRow {
  band: string; // "0.7-0.8"
  lower: number;
  upper: number;
  count: number;
  meanConfidence: number | null;
  acceptance: number | null;
}

export interface ReportCluster {
  /** The stable cluster id, as commands print and accept it ("c3f9a1"). */
  id: string;
  /** Its top terms. */
  label: string;
  size: number;
  terms: string[];
  transcripts: number;
  cohesion: number;
  status: 'open' | 'promoted' | 'dismissed';
  /** The passages closest to its centre, credited like every other quote. */
  examples: ReportQuote[];
}

export interface AgreementRow {
  theme: string; // a path, or "all themes, pooled"
  units: number;
  percentAgreement: number | null;
  kappa: number | null;
  alpha: number | null;
  /** Landis & Koch band of kappa. */
  kappaBand: string | null;
  /** Krippendorff's guidance for alpha: reliable, tentative, unreliable. */
  alphaGuidance: string | null;
  /** Fleiss' kappa for three or more coders, on the units all of them reviewed, and its band. */
  fleiss?: number | null;
  fleissUnits?: number;
  fleissBand?: string | null;
}

/** Two coders of three or more, on the passages both reviewed (pooled over passage-theme pairs). */
export interface PairRow {
  coders: [string, string];
  passages: number;
  percentAgreement: number | null;
  kappa: number | null;
  kappaBand: string | null;
  alpha: number | null;
  meanKappa: number | null;
  themesInMeanKappa: number;
}

export interface ReportData {
  title: string;
  generatedAt: string;
  counts: {
    transcripts: number;
    /** Transcripts with at least one current coding (as status counts them). */
    codedTranscripts?: number;
    passages: number;
    participant: number;
    coded: number;
    /** Participant passages not coded that a coder marked "reviewed, nothing to code". */
    nothingToCode?: number;
    themes: number;
    revision: number | null;
  };
  themes: ReportTheme[];
  revisions: ReportRevision[];
  /** Theme x transcript passage counts (rolled up over sub-themes), themes in template order. */
  /** `themes` are theme paths, as in `themes[].path`. */
  heatmap: { transcripts: string[]; themes: string[]; counts: number[][] };
  acceptance: { overall: AcceptanceRow; perTheme: AcceptanceRow[]; /** Cumulative acceptance rate after each decided suggestion. */
    overTime: { index: number; at: string; rate: number }[]; calibration: CalibrationRow[];
    /** Suggestions decided one by one, and those accepted in bulk (decide --all-above), counted apart. */
    oneByOne?: AcceptanceRow; bulkAccepted?: number };
  /** Template growth: themes first coded or added in each transcript, in coding order. */
  growth: { transcript: string; order: number; newThemes: number; newSubThemes: number; cumulative: number }[];
  /** Themes of the template no passage carries yet (not on the growth curve). */
  notYetCoded?: number;
  unclaimed: { share: number | null; passages: number; unclaimed: number; clusters: ReportCluster[] };
  agreement: {
    coders: string[];
    /** Participant passages reviewed by two or more of the coders: the units. */
    units: number;
    rows: AgreementRow[];
    /** Every pair of coders when there are three or more; empty otherwise. */
    pairwise?: PairRow[];
    /** Passage-theme pairs on which the coders differ (listed by "trellis agree --list"). */
    disagreements: number;
    bandsSource: string;
    guidanceSource: string;
    /** Said when a coder's codings include accepted suggestions. */
    circularity: string | null;
    caution: string;
  } | null;
  cautions: string[];
  /** Quotes researchers pinned and dropped (trellis quote), over all themes. */
  quoteChoices?: { pinned: number; dropped: number };
  /** How speakers and transcripts are named in this document (aliases or as stored); null when not pseudonymised. */
  pseudonyms?: string | null;
  /** Every memo, oldest first; theme memos also sit on their theme (ReportTheme.memos). */
  memos?: ReportMemo[];
  /**
   * Each integrative theme: its passages, and how many of them carry each top-level theme.
   * Absent or empty when the template has none.
   */
  integrative?: { themeId: string; name: string; passages: number; touches: number; across: { name: string; passages: number }[] }[];
}
