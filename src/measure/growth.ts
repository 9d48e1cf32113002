/**
 * Template growth by transcript: for each transcript in coding order, the themes that entered the
 * template's working life there, so that the curve shows how the template grew.
 *
 * A theme enters at the first transcript (in coding order) that carries a coding of it, or at the
 * transcript being coded when the theme was added to the template (the last one whose first
 * coding is at or before the revision), whichever comes first. So the initial template's themes,
 * a priori ones included, count at the transcripts of the first batch that introduced them, and a
 * theme added mid-way counts where the analyst was working when it was added. A theme of the
 * initial template that no passage carries yet has entered nowhere: it is reported apart.
 *
 * A flattening curve says that recent transcripts added little to the template; it is not proof
 * that the template is complete (the next transcript may still differ), and it depends on the
 * order in which transcripts were coded.
 */

export interface GrowthTheme {
  id: string;
  /** The theme's path now (or its name with "(retired)"). */
  path: string;
  /** A top-level theme, or a sub-theme at any depth. */
  topLevel: boolean;
  /** ISO 8601: when the theme was added to the template. */
  addedAt: string;
}

export interface TranscriptStart {
  transcript: string;
  /** ISO 8601: when the transcript's first coding was made. */
  firstCodedAt: string;
}

export interface GrowthInput {
  themes: readonly GrowthTheme[];
  /** The transcripts coded so far; sorted here by first coding (ties keep the given order). */
  transcripts: readonly TranscriptStart[];
  /** Which transcripts carry a coding of which theme (any order; repeats allowed). */
  coded: readonly { themeId: string; transcript: string }[];
}

export interface Entered {
  id: string;
  path: string;
  topLevel: boolean;
  /** 'coded': first coded in this transcript; 'added': added to the template while it was coded. */
  how: 'coded' | 'added';
}

export interface GrowthPoint {
  transcript: string;
  /** 1-based position in coding order. */
  order: number;
  first_coded_at: string;
  new_themes: number;
  new_sub_themes: number;
  entered: Entered[];
  /** Themes and sub-themes that have entered so far, this transcript included. */
  cumulative: number;
}

export interface GrowthReport {
  curve: GrowthPoint[];
  /** Themes of the template before coding began that no passage carries yet. */
  not_yet_coded: { id: string; path: string; topLevel: boolean }[];
  note: string;
}

export const GROWTH_NOTE =
  'Template growth shows, for each transcript in the order it was coded, the themes first coded or added there. ' +
  'A flattening curve means recent transcripts added little to the template; it is not proof that the template is complete, ' +
  'and the curve depends on the order in which transcripts were coded.';

function time(iso: string, what: string): number {
  const t = Date.parse(iso);
  if (Number.isNaN(t)) throw new RangeError(`${what} is not an ISO 8601 timestamp: ${JSON.stringify(iso)}`);
  return t;
}

export function templateGrowth(input: GrowthInput): GrowthReport {
  const order = input.transcripts.map((tr) => ({ tr, t: time(tr.firstCodedAt, `first coding of ${tr.transcript}`) })).sort((a, b) => a.t - b.t);
  const place = new Map(order.map((o, i) => [o.tr.transcript, i]));
  const firstCoded = new Map<string, number>();
  for (const c of input.coded) {
    const i = place.get(c.transcript);
    if (i === undefined) continue;
    const was = firstCoded.get(c.themeId);
    if (was === undefined || i < was) firstCoded.set(c.themeId, i);
  }
  /** The transcript being coded at time t: the last begun at or before it; -1 before coding began. */
  const workingAt = (t: number): number => {
    let lo = 0;
    let hi = order.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (order[mid]!.t <= t) lo = mid + 1;
      else hi = mid;
    }
    return lo - 1;
  };
  const buckets: Entered[][] = order.map(() => []);
  const notYet: GrowthReport['not_yet_coded'] = [];
  for (const th of input.themes) {
    const coded = firstCoded.get(th.id);
    const added = workingAt(time(th.addedAt, `addition of ${th.path}`));
    const viaAdd = added >= 0 ? added : undefined;
    let at: number | undefined;
    let how: Entered['how'] = 'coded';
    if (coded !== undefined && (viaAdd === undefined || coded <= viaAdd)) at = coded;
    else if (viaAdd !== undefined) {
      at = viaAdd;
      how = 'added';
    }
    if (at === undefined) notYet.push({ id: th.id, path: th.path, topLevel: th.topLevel });
    else buckets[at]!.push({ id: th.id, path: th.path, topLevel: th.topLevel, how });
  }
  let cumulative = 0;
  const curve = order.map(({ tr }, i): GrowthPoint => {
    const entered = buckets[i]!;
    const top = entered.filter((e) => e.topLevel).length;
    cumulative += entered.length;
    return { transcript: tr.transcript, order: i + 1, first_coded_at: tr.firstCodedAt, new_themes: top, new_sub_themes: entered.length - top, entered, cumulative };
  });
  return { curve, not_yet_coded: notYet, note: GROWTH_NOTE };
}
