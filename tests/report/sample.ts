/**
 * An invented but realistic ReportData: a study of an electronic handover system on hospital
 * wards, 12 interview transcripts, a four-level template, two coders. All names, quotes and
 * figures are made up for the tests; counts come from a seeded generator so every run is equal.
 */

import { AGREEMENT_CAUTION, KRIPPENDORFF_SOURCE, LANDIS_KOCH_SOURCE, agreementBand, alphaGuidance } from '../../src/measure/bands.js';
import type { AcceptanceRow, CalibrationRow, ReportCluster, ReportData, ReportTheme } from '../../src/report/types.js';
import { seededRandom } from '../../src/math/random.js';

type Quote = ReportTheme['quotes'][number];

interface Spec {
  name: string;
  apriori?: boolean;
  definition?: string;
  include?: string;
  exclude?: string;
  seeds?: string[];
  /** Relative weight of direct codings per transcript. */
  weight: number;
  /** Coding began after this transcript (0-based order index); earlier transcripts have none. */
  from?: number;
  quotes?: [transcript: number, speaker: string | null, time: string, text: string][];
  children?: Spec[];
}

export const TRANSCRIPTS = [
  't01-birch-staff-nurse',
  't02-heron-fy1',
  't03-quay-hca',
  't04-maple-staff-nurse',
  't05-ward7-fy2',
  't06-heron-night-nurse',
  't07-birch-ward-manager',
  't08-maple-hca',
  't09-quay-junior-sister',
  't10-quay-fy1',
  't11-ward7-new-nurse',
  't12-birch-hca',
];

const TEMPLATE: Spec[] = [
  {
    name: 'Workload',
    apriori: true,
    definition: 'Demands on staff time and effort created or changed by the electronic handover.',
    include: 'How long handover tasks take, and who ends up doing them.',
    exclude: 'Staffing shortfalls that have nothing to do with handover.',
    seeds: ['busy', 'time', 'minutes', 'longer', 'agency', 'clicks'],
    weight: 1,
    quotes: [[0, 'Nell', '0:02:10', 'By the time everyone has logged on, handover has eaten twenty minutes of a twelve-and-a-half-hour shift, and that is before anyone has seen a patient.']],
    children: [
      {
        name: 'Time on the system',
        definition: 'Minutes spent logging in, waiting for screens, typing and re-entering information.',
        seeds: ['log-in', 'password', 'frozen', 'loading', 'typing'],
        weight: 1.5,
        quotes: [
          [3, 'Farida', '0:06:41', 'You type the obs into the handheld, then it wants them again on the desktop because the two "don\'t talk". So that\'s twice, every patient, every round.'],
          [7, 'Joe', '0:11:02', 'It\'s the spinning wheel. You sit there watching it go round & round while the buzzers are going off.'],
        ],
        children: [
          {
            name: 'Logging in',
            seeds: ['card', 'password', 'log-in'],
            weight: 1.2,
            quotes: [[0, 'Nell', '0:01:48', 'Card in, password, pick the ward, pick your patients. I timed it once: four minutes before I saw a single name.']],
          },
          {
            name: 'Shared devices',
            definition: 'Too few tablets or terminals, flat batteries, queueing for a device.',
            weight: 1,
            quotes: [[2, 'Maggie', '0:04:30', 'Two terminals and four tablets for the whole of days. Half seven, there\'s a queue like it\'s the January sales.']],
          },
        ],
      },
      {
        name: 'Staffing levels',
        definition: 'Vacancies, bank and agency staff, and staff without their own access to the system.',
        seeds: ['short', 'agency', 'bank', 'vacancies'],
        weight: 1.3,
        quotes: [
          [6, 'Rosalind', '0:09:15', 'Agency nurses don\'t get a log-in for the first shift, sometimes the first three. So one of mine hands over to them verbally and then does their entries too.'],
          [8, 'Aisha', '0:03:57', 'When we\'re two down on nights, the handover note is the first thing that gets cut short. It\'s not laziness; it\'s maths.'],
        ],
      },
      { name: 'Interruptions', weight: 0.6, quotes: [[10, 'Tom', '0:05:20', 'Every time I start a handover entry someone needs me, and when I come back it\'s logged me out.']] },
    ],
  },
  {
    name: 'Patient safety',
    apriori: true,
    definition: 'Ways the electronic handover makes patients safer or less safe.',
    seeds: ['safe', 'risk', 'missed', 'allergy', 'score', 'escalate'],
    weight: 0.8,
    children: [
      {
        name: 'Information at handover',
        definition: 'What travels, or fails to travel, from one shift to the next.',
        weight: 1,
        quotes: [[5, 'Owen', '0:07:33', 'The screen tells you what\'s been done. It doesn\'t tell you what the night was like, and that\'s half of what you need.']],
        children: [
          {
            name: 'Lost information',
            definition: 'Personal or contextual knowledge about a patient that no longer reaches the next shift.',
            weight: 1.4,
            quotes: [
              [0, 'Nell', '0:03:11', 'There was a lady who settled if you put the old-time music on. That used to get passed on. The box says "confused, wandering risk", which is true, but it doesn\'t tell you about the radio.'],
              [11, 'Bea', '0:02:44', 'Little things, like he takes his tablets better with yoghurt. Nobody writes that in a box.'],
            ],
          },
          {
            name: 'Medication details',
            weight: 0.7,
            children: [
              {
                name: 'Allergies',
                definition: 'Allergy information as recorded, displayed or missed.',
                seeds: ['allergy', 'allergic', 'banner', 'wristband'],
                weight: 0.8,
                from: 2,
                quotes: [[4, 'Kwame', '0:12:05', 'The allergy banner is red, the falls banner is red, the "patient has a visitor" banner is red. After a week you stop seeing red.']],
              },
            ],
          },
        ],
      },
      {
        name: 'Deterioration and escalation',
        definition: 'Early warning scores, flags and getting help for a patient who is getting worse.',
        include: 'Delays between taking observations and entering them.',
        seeds: ['warning', 'score', 'sats', 'outreach', 'bleep'],
        weight: 1.1,
        quotes: [
          [1, 'Sunil', '0:08:20', 'If the systolic is <90 it flags, but only once somebody has entered it, and on a bad night that can be an hour after the obs were done.'],
          [9, 'Hana', '0:04:02', 'I got bleeped for a score of 7 that was three hours old. He was fine by then. The one who wasn\'t fine hadn\'t been entered yet.'],
        ],
      },
      {
        name: 'Trust in the system',
        definition: 'How far staff rely on what the screen shows, including entries that are out of date.',
        weight: 0.9,
        quotes: [[8, 'Aisha', '0:10:40', 'I trust it for drugs. I don\'t trust it for "mobilising independently"; that was true on Tuesday.']],
      },
    ],
  },
  {
    name: 'Training and support',
    apriori: true,
    definition: 'How staff learned to use the system and where they turn for help.',
    seeds: ['training', 'session', 'e-learning', 'super-user', 'helpdesk'],
    weight: 0.7,
    children: [
      { name: 'Initial training', weight: 0.8, quotes: [[10, 'Tom', '0:01:15', 'An hour of e-learning in the week I started, on a laptop that wasn\'t the one we use. That was it.']] },
      {
        name: 'Learning from colleagues',
        include: 'Super-users and informal help between staff.',
        weight: 1.1,
        quotes: [[2, 'Maggie', '0:06:02', 'Everything I know about it, Dev showed me on a night shift. He\'s not even a super-user, he just likes computers.']],
      },
      {
        name: 'IT helpdesk',
        weight: 0.5,
        children: [{ name: 'Out-of-hours support', weight: 0.4, from: 4, quotes: [[5, 'Owen', '0:09:48', 'Three in the morning, the helpdesk is a voicemail. So you write it on paper and hope.']] }],
      },
    ],
  },
  {
    name: 'Team communication',
    definition: 'Conversation and relationships between staff groups around handover, raised by participants outside the brief.',
    exclude: 'Help with using the system, which belongs under Training and support.',
    seeds: ['talk', 'conversation', 'nurses', 'doctors', 'night', 'day'],
    weight: 0.6,
    from: 1,
    children: [
      {
        name: 'Losing face-to-face talk',
        weight: 1.4,
        from: 1,
        quotes: [
          [6, 'Rosalind', '0:04:12', 'We used to walk the bays together. Now the night nurse is packing her bag while you read, and by bed twelve she\'s gone.'],
          [3, 'Farida', '0:02:58', 'You lose the "by the way". The by-the-way is where all the important stuff was.'],
        ],
      },
      { name: 'Doctors and nurses', weight: 0.7, from: 3, quotes: [[1, 'Sunil', '0:05:30', 'The doctors\' handover and ours are two different screens. We find out about plan changes from the patient.']] },
      { name: 'Night and day staff', weight: 0.8, from: 5, quotes: [[5, 'Owen', '0:03:05', 'Days think nights don\'t write enough; nights think days don\'t read it.']] },
    ],
  },
  {
    name: 'Workarounds',
    definition: 'Ways staff get round the system to get the work done, promoted from a cluster of unclaimed passages.',
    seeds: ['paper', 'notes', 'print', 'scrap', 'password'],
    weight: 0.5,
    from: 6,
    children: [
      { name: 'Paper notes', weight: 1.5, from: 6, quotes: [[7, 'Joe', '0:08:50', 'Everyone still has the folded sheet in their pocket. The system is for the record; the paper is for the shift.']] },
      { name: 'Shared log-ins', weight: 0.6, from: 8, quotes: [[11, 'Bea', '0:06:15', 'If agency haven\'t got access they use mine while I\'m stood next to them. I know we\'re not supposed to.']] },
    ],
  },
];

const random = seededRandom; // the invented counts are the same on every run

interface Flat {
  spec: Spec;
  number: string;
  path: string;
  depth: number;
  parent: number | null;
}

function flatten(specs: Spec[], prefix = '', path = '', depth = 0, parent: number | null = null, out: Flat[] = []): Flat[] {
  specs.forEach((s, i) => {
    const number = prefix ? `${prefix}.${i + 1}` : String(i + 1);
    const p = path ? `${path} > ${s.name}` : s.name;
    const at = out.length;
    out.push({ spec: s, number, path: p, depth, parent });
    flatten(s.children ?? [], number, p, depth + 1, at, out);
  });
  return out;
}

const rate = (accepted: number, decided: number) => (decided ? accepted / decided : null);

export function sampleReport(): ReportData {
  const rnd = random(20250214);
  const flat = flatten(TEMPLATE);
  const nT = TRANSCRIPTS.length;

  // Direct codings per theme and transcript, then rolled up over sub-themes (children first).
  const direct = flat.map((f) =>
    TRANSCRIPTS.map((_, j) => {
      const from = Math.max(f.spec.from ?? 0, ...ancestors(flat, f).map((a) => a.spec.from ?? 0));
      if (j < from) return 0;
      return Math.floor(rnd() * 4.2 * f.spec.weight);
    }),
  );
  const rolled = direct.map((row) => [...row]);
  for (let i = flat.length - 1; i >= 0; i--) {
    const p = flat[i]!.parent;
    if (p !== null) for (let j = 0; j < nT; j++) rolled[p]![j]! += rolled[i]![j]!;
  }

  const themes: ReportTheme[] = flat.map((f, i) => ({
    id: `th${String(i + 1).padStart(2, '0')}`,
    number: f.number,
    name: f.spec.name,
    path: f.path,
    depth: f.depth,
    apriori: f.spec.apriori ?? false,
    definition: f.spec.definition ?? '',
    include: f.spec.include ?? '',
    exclude: f.spec.exclude ?? '',
    seeds: f.spec.seeds ?? [],
    direct: direct[i]!.reduce((a, b) => a + b, 0),
    total: rolled[i]!.reduce((a, b) => a + b, 0),
    quotes: (f.spec.quotes ?? []).map(([t, speaker, time, text], k): Quote => ({
      passageId: `${TRANSCRIPTS[t]}#${12 + k * 7 + i}`,
      transcript: TRANSCRIPTS[t]!,
      speaker,
      time,
      text,
    })),
  }));

  const perTheme: AcceptanceRow[] = themes.map((t, i) => {
    const decided = i % 7 === 6 ? 3 : Math.round(6 + rnd() * 30);
    const accepted = Math.round(decided * (0.45 + rnd() * 0.45));
    return { label: t.path, decided, accepted, rate: rate(accepted, decided) };
  });
  // A theme with suggestions but no decisions yet, and a retired one.
  perTheme[12] = { ...perTheme[12]!, decided: 0, accepted: 0, rate: null };
  perTheme.push({ label: 'Workload > Paperwork (retired)', decided: 4, accepted: 1, rate: 0.25 });
  const decided = perTheme.reduce((a, r) => a + r.decided, 0);
  const accepted = perTheme.reduce((a, r) => a + r.accepted, 0);

  // Cumulative acceptance after each decision, rising as the profiles are refitted, and ending
  // at the overall rate: `accepted` of the `decided` outcomes are acceptances, more of them late.
  const order = Array.from({ length: decided }, (_, k) => ({ k, key: rnd() - 0.35 * (k / decided) }));
  const acceptedAt = new Set(order.sort((a, b) => a.key - b.key).slice(0, accepted).map((o) => o.k));
  const overTime: ReportData['acceptance']['overTime'] = [];
  let acc = 0;
  const start = Date.parse('2025-02-17T09:00:00Z');
  for (let k = 1; k <= decided; k++) {
    if (acceptedAt.has(k - 1)) acc++;
    overTime.push({ index: k, at: new Date(start + k * 47 * 60_000).toISOString(), rate: acc / k });
  }

  const calibration: CalibrationRow[] = Array.from({ length: 10 }, (_, b) => {
    const lower = b / 10;
    const upper = (b + 1) / 10;
    const count = b < 3 ? 0 : [0, 0, 0, 14, 31, 52, 60, 48, 27, 11][b]!;
    const mean = count ? lower + 0.03 + rnd() * 0.05 : null;
    const acceptance = count ? Math.min(1, Math.max(0, (mean ?? 0) - 0.08 + rnd() * 0.1)) : null;
    return { band: `${lower.toFixed(1)}-${upper.toFixed(1)}`, lower, upper, count, meanConfidence: mean, acceptance };
  });

  const newThemes = [0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 0];
  const newSubs = [2, 1, 3, 2, 2, 1, 2, 1, 1, 0, 0, 0];
  let cum = 0;
  const growth = TRANSCRIPTS.map((t, i) => ({ transcript: t, order: i + 1, newThemes: newThemes[i]!, newSubThemes: newSubs[i]!, cumulative: (cum += newThemes[i]! + newSubs[i]!) }));

  const clusterQuote = (text: string, i: number) => ({ passageId: `${TRANSCRIPTS[i % TRANSCRIPTS.length]}#${10 + i}`, transcript: TRANSCRIPTS[i % TRANSCRIPTS.length]!, speaker: `P${String(i).padStart(2, '0')}`, time: `0:0${i % 10}:15`, text });
  const clusters: ReportCluster[] = [
    {
      id: 'c4e1d2',
      label: 'discharge · pharmacy · TTOs',
      size: 17,
      terms: ['discharge', 'pharmacy', 'TTOs', 'waiting', 'transport'],
      transcripts: 6,
      cohesion: 0.38,
      status: 'open',
      examples: [clusterQuote('Half the handover is who\'s waiting for TTOs from pharmacy, and there\'s nowhere on the screen for it.', 1), clusterQuote('Discharge lounge rings at ten asking who\'s coming down, and we\'re still doing handover.', 2)],
    },
    {
      id: 'c5a0b9',
      label: 'relatives · phone calls',
      size: 9,
      terms: ['relatives', 'phone', 'daughter', 'ring', 'update'],
      transcripts: 4,
      cohesion: 0.29,
      status: 'open',
      examples: [clusterQuote('The daughter rings every morning at eight. Who spoke to her last night? It\'s not on there.', 3)],
    },
    {
      id: 'c2f7c3',
      label: 'paper · notes · print',
      size: 21,
      terms: ['paper', 'notes', 'print', 'pocket', 'sheet'],
      transcripts: 7,
      cohesion: 0.44,
      status: 'promoted',
      examples: [clusterQuote('We print the list at the start and scribble on it all day.', 4)],
    },
    {
      id: 'c3d8e6',
      label: 'car park · parking',
      size: 6,
      terms: ['parking', 'car', 'permit'],
      transcripts: 3,
      cohesion: 0.51,
      status: 'dismissed',
      examples: [clusterQuote('Honestly the biggest problem on this site is the car park.', 5)],
    },
  ];
  const unclaimedCount = 96;
  const scored = 612;

  const agreementRows = [
    ['Workload', 118, 0.881, 0.71, 0.712],
    ['Workload > Staffing levels', 118, 0.949, 0.78, 0.781],
    ['Patient safety', 118, 0.839, 0.62, 0.618],
    ['Patient safety > Trust in the system', 118, 0.966, 0.33, 0.332],
    ['Training and support', 118, 0.915, 0.74, 0.741],
    ['Team communication', 118, 0.797, 0.46, 0.459],
  ].map(([theme, units, pa, k, a]) => ({
    theme: theme as string,
    units: units as number,
    percentAgreement: pa as number,
    kappa: k as number,
    alpha: a as number,
    kappaBand: agreementBand(k as number),
    alphaGuidance: alphaGuidance(a as number),
  }));
  agreementRows.push({ theme: 'all themes, pooled', units: 708, percentAgreement: 0.891, kappa: 0.64, alpha: 0.641, kappaBand: agreementBand(0.64), alphaGuidance: alphaGuidance(0.641) });

  return {
    title: 'Electronic handover on four wards: template analysis',
    generatedAt: '2025-03-14T16:05:12.000Z',
    counts: { transcripts: nT, passages: 1_184, participant: 842, coded: 517, themes: themes.length, revision: 6 },
    themes,
    revisions: [
      {
        rev: 1,
        at: '2025-01-20T10:02:00.000Z',
        author: 'alex',
        action: 'set template.txt',
        reason: 'a priori themes from the research brief',
        changes: [
          'added Workload',
          'added Workload > Time on the system',
          'added Workload > Staffing',
          'added Workload > Interruptions',
          'added Patient safety',
          'added Patient safety > Information at handover',
          'added Patient safety > Information at handover > Lost information',
          'added Patient safety > Deterioration and escalation',
          'added Patient safety > Trust in the system',
          'added Training and support',
          'added Training and support > Initial training',
          'added Training and support > Learning from colleagues',
          'added Training and support > IT helpdesk',
        ],
      },
      {
        rev: 2,
        at: '2025-02-03T14:40:00.000Z',
        author: 'alex',
        action: 'set template.txt',
        reason: 'after coding t01-t04: talk between staff groups came up in every interview',
        changes: [
          'added Team communication',
          'added Team communication > Losing face-to-face talk',
          'added Team communication > Doctors and nurses',
          'added Workload > Time on the system > Logging in',
          'added Workload > Time on the system > Shared devices',
        ],
      },
      { rev: 3, at: '2025-02-10T09:15:00.000Z', author: 'sam', action: 'rename', reason: 'clearer name', changes: ['renamed Workload > Staffing -> Workload > Staffing levels'] },
      {
        rev: 4,
        at: '2025-02-18T11:30:00.000Z',
        author: 'alex',
        action: 'promote cluster 2',
        reason: 'cluster reviewed with the team on 18 February',
        changes: ['added Workarounds', 'added Workarounds > Paper notes', 'added Workarounds > Shared log-ins', 'added Team communication > Night and day staff'],
      },
      {
        rev: 5,
        at: '2025-02-25T15:05:00.000Z',
        author: 'sam',
        action: 'add',
        reason: 'allergy banners raised in t05 & t09',
        changes: [
          'added Patient safety > Information at handover > Medication details',
          'added Patient safety > Information at handover > Medication details > Allergies',
          'added Training and support > IT helpdesk > Out-of-hours support',
        ],
      },
      { rev: 6, at: '2025-03-04T12:00:00.000Z', author: 'alex', action: 'edit', reason: null, changes: ['edited Patient safety > Trust in the system (definition)'] },
    ],
    heatmap: { transcripts: [...TRANSCRIPTS], themes: themes.map((t) => t.path), counts: rolled },
    acceptance: {
      overall: { label: 'all suggestions', decided, accepted, rate: rate(accepted, decided) },
      perTheme,
      overTime,
      calibration,
    },
    growth,
    unclaimed: { share: unclaimedCount / scored, passages: scored, unclaimed: unclaimedCount, clusters },
    agreement: {
      coders: ['alex', 'sam'],
      units: 118,
      rows: agreementRows,
      disagreements: 41,
      bandsSource: LANDIS_KOCH_SOURCE,
      guidanceSource: KRIPPENDORFF_SOURCE,
      circularity: null,
      caution: AGREEMENT_CAUTION,
    },
    cautions: [
      'Suggestions are aids, not codings: every coding in this report was made or confirmed by a researcher.',
      'Acceptance measures how often coders took suggestions; a high rate can also mean coders deferred to the tool. Read it together with the agreement figures.',
      'The quotes are from interview transcripts. Check that they are de-identified before this report leaves the research team.',
      'Interpretation, ethics approval, consent and data-protection duties remain with the research team.',
    ],
  };
}

function ancestors(flat: Flat[], f: Flat): Flat[] {
  const out: Flat[] = [];
  let p = f.parent;
  while (p !== null) {
    out.push(flat[p]!);
    p = flat[p]!.parent;
  }
  return out;
}

/** A study just begun: a template and transcripts, but no decisions, clusters, agreement or revisions. */
export function emptyReport(): ReportData {
  const full = sampleReport();
  return {
    ...full,
    title: 'A study just begun',
    counts: { ...full.counts, coded: 0, revision: null },
    themes: full.themes.map((t) => ({ ...t, direct: 0, total: 0, quotes: [] })),
    revisions: [],
    heatmap: { transcripts: [], themes: [], counts: [] },
    acceptance: {
      overall: { label: 'all suggestions', decided: 0, accepted: 0, rate: null },
      perTheme: [],
      overTime: [],
      calibration: full.acceptance.calibration.map((c) => ({ ...c, count: 0, meanConfidence: null, acceptance: null })),
    },
    growth: [],
    unclaimed: { share: null, passages: 0, unclaimed: 0, clusters: [] },
    agreement: null,
    cautions: [],
  };
}

/** A large study: 60 transcripts with long names, for layout checks at scale. */
export function largeReport(): ReportData {
  const d = sampleReport();
  const n = 60;
  const names = Array.from({ length: n }, (_, i) => `p${String(i + 1).padStart(2, '0')}-${['larch', 'heron', 'quay', 'maple'][i % 4]}-${['staff-nurse', 'healthcare-assistant', 'foundation-doctor'][i % 3]}`);
  const counts = d.heatmap.counts.map((row) => names.map((_, j) => (row[j % row.length]! * (j + 3)) % 23));
  let cum = 0;
  const growth = names.map((t, i) => {
    const newThemes = i % 9 === 0 ? 1 : 0;
    const newSubThemes = i < 30 ? (i * 7) % 3 : 0;
    return { transcript: t, order: i + 1, newThemes, newSubThemes, cumulative: (cum += newThemes + newSubThemes) };
  });
  const overTime = Array.from({ length: 2000 }, (_, k) => ({ index: k + 1, at: new Date(Date.parse('2025-04-01T08:00:00Z') + k * 600_000).toISOString(), rate: 0.5 + 0.25 * Math.sin(k / 300) * Math.exp(-k / 800) + 0.2 * (k / 2000) }));
  return {
    ...d,
    counts: { ...d.counts, transcripts: n },
    heatmap: { transcripts: names, themes: d.heatmap.themes, counts },
    growth,
    acceptance: { ...d.acceptance, overTime },
  };
}
