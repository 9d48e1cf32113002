/** Invented studies for the suggestion tests: a tiny hand-made one and a seeded synthetic one. */
import type { Coding, ModelPassage, ThemeInfo } from '../../src/suggest/types.js';
import { seededRandom as rng } from '../../src/math/random.js';

export const THEMES: ThemeInfo[] = [
  { id: 'work', parentId: null, name: 'Workload', path: 'Workload', apriori: true, definition: 'How much work there is.', seeds: [] },
  { id: 'staff', parentId: 'work', name: 'Staffing', path: 'Workload > Staffing', apriori: false, definition: '', seeds: ['rota'] },
  { id: 'admin', parentId: 'work', name: 'Admin', path: 'Workload > Admin', apriori: false, definition: '', seeds: [] },
  { id: 'support', parentId: null, name: 'Support', path: 'Support', apriori: false, definition: '', seeds: [] },
  { id: 'pay', parentId: null, name: 'Pay', path: 'Pay', apriori: true, definition: 'Talk about salary and money.', seeds: ['salary', 'wage', 'pay'] },
];

/** Participant answers by theme, as content lemmas (what contentLemmas gives at the edge). */
const TALK: Record<string, string[][]> = {
  staff: [
    ['rota', 'short', 'staff', 'shift', 'cover', 'agency', 'nurse'],
    ['night', 'shift', 'cover', 'rota', 'gap', 'agency', 'staff'],
    ['ward', 'short', 'staff', 'nurse', 'shift', 'sickness', 'cover'],
  ],
  admin: [
    ['paperwork', 'form', 'computer', 'record', 'documentation', 'hour'],
    ['form', 'fill', 'computer', 'system', 'paperwork', 'audit'],
    ['documentation', 'record', 'audit', 'form', 'email', 'system'],
  ],
  support: [
    ['manager', 'listen', 'support', 'team', 'colleague', 'help'],
    ['team', 'colleague', 'support', 'debrief', 'manager', 'kind'],
    ['supervisor', 'listen', 'support', 'help', 'team', 'appreciate'],
  ],
};

const QUESTION = ['tell', 'day', 'ward'];

/**
 * Six transcripts t1..t6: each an interviewer question then answers on staffing, admin and
 * support (two answers each, varied by transcript). t1-t4 are coded; t5, t6 are not.
 */
export function tinyStudy(): { passages: ModelPassage[]; codings: Coding[]; truth: Map<string, string> } {
  const passages: ModelPassage[] = [];
  const codings: Coding[] = [];
  const truth = new Map<string, string>();
  for (let t = 1; t <= 6; t++) {
    let ord = 0;
    const add = (role: 'interviewer' | 'participant', terms: string[], theme?: string) => {
      const id = `t${t}#${++ord}`;
      passages.push({ id, transcript: `t${t}`, ordinal: ord, role, terms });
      if (theme) {
        truth.set(id, theme);
        if (t <= 4) codings.push({ passageId: id, themeId: theme });
      }
    };
    for (const theme of ['staff', 'admin', 'support']) {
      add('interviewer', QUESTION);
      for (let k = 0; k < 2; k++) add('participant', TALK[theme]![(t + k) % 3]!, theme);
    }
    if (t === 6) add('participant', ['salary', 'low', 'wage', 'money', 'bill']);
  }
  return { passages, codings, truth };
}


export const FLAT: ThemeInfo[] = ['a', 'b', 'c', 'd'].map((id) => ({ id, parentId: null, name: id, path: id, apriori: false, definition: '', seeds: [] }));

/**
 * A seeded synthetic study: 24 transcripts of 20 passages, 4 flat themes, each passage 8 words,
 * 40% from its theme's 10 words and the rest from 40 shared words. `runs`: a transcript talks
 * about one theme for stretches of 5 passages (context informative); otherwise every passage's
 * theme is drawn independently (context uninformative). The first 12 transcripts are coded.
 */
export function syntheticStudy(runs: boolean, seed = 1): { passages: ModelPassage[]; codings: Coding[] } {
  const r = rng(seed);
  const themes = FLAT.map((t) => t.id);
  const own = (th: string) => Array.from({ length: 10 }, (_, i) => `${th}${i}`);
  const shared = Array.from({ length: 40 }, (_, i) => `w${i}`);
  const passages: ModelPassage[] = [];
  const codings: Coding[] = [];
  for (let t = 0; t < 24; t++) {
    let theme = themes[Math.floor(r() * 4)]!;
    for (let o = 1; o <= 20; o++) {
      if (!runs || o % 5 === 1) theme = themes[Math.floor(r() * 4)]!;
      const terms = Array.from({ length: 8 }, () => (r() < 0.4 ? own(theme)[Math.floor(r() * 10)]! : shared[Math.floor(r() * 40)]!));
      const id = `s${t}#${o}`;
      passages.push({ id, transcript: `s${t}`, ordinal: o, role: 'participant', terms });
      if (t < 12) codings.push({ passageId: id, themeId: theme });
    }
  }
  return { passages, codings };
}

/**
 * The tiny study plus two uncoded transcripts t7, t8 like the others, each with two answers of
 * messaging talk (email, phone, message) that shares "email", "system" and "computer" with admin
 * talk. A coder rejected Admin for t7's messaging answers; t8's are new.
 */
export function messagingStudy(): { passages: ModelPassage[]; codings: Coding[]; negatives: Coding[]; fresh: string[]; t7: string[] } {
  const { passages, codings } = tinyStudy();
  const messaging = [
    ['email', 'message', 'phone', 'system', 'inbox', 'computer'],
    ['phone', 'message', 'text', 'computer', 'reply', 'email'],
    ['message', 'email', 'inbox', 'system', 'phone', 'text'],
  ];
  const negatives: Coding[] = [];
  const fresh: string[] = [];
  const t7: string[] = [];
  for (const t of [7, 8]) {
    let ord = 0;
    const add = (role: 'interviewer' | 'participant', terms: string[]) => {
      const id = `t${t}#${++ord}`;
      passages.push({ id, transcript: `t${t}`, ordinal: ord, role, terms });
      return id;
    };
    for (const theme of ['staff', 'admin', 'support', 'messaging']) {
      add('interviewer', QUESTION);
      for (let k = 0; k < 2; k++) {
        const terms = theme === 'messaging' ? messaging[(t + k) % 3]! : TALK[theme]![(t + k) % 3]!;
        const id = add('participant', terms);
        if (theme !== 'messaging') continue;
        if (t === 7) {
          negatives.push({ passageId: id, themeId: 'admin' });
          t7.push(id);
        } else fresh.push(id);
      }
    }
  }
  return { passages, codings, negatives, fresh, t7 };
}
