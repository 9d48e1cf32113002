import { eng } from 'stopword';

/**
 * Words of spoken English that carry no topic: fillers, back-channels and hedges that fill
 * transcripts but not written text, so the `stopword` list does not have them.
 */
export const SPOKEN_FILLERS: readonly string[] = [
  'um', 'uh', 'erm', 'er', 'ah', 'eh', 'hmm', 'mm', 'mhm', 'uh-huh', 'yeah', 'yep', 'yes', 'no', 'nope',
  'ok', 'okay', 'oh', 'well', 'like', 'just', 'really', 'actually', 'basically', 'literally',
  'kind', 'sort', 'thing', 'stuff', 'know', 'mean', 'guess', 'suppose', 'right', 'so', 'gonna',
  'wanna', 'gotta', 'lot', 'bit', 'quite', 'pretty', 'get', 'go', 'do', 'say', 'think', 'would',
  'could', 'should', 'can', 'will', 'might', 'must', 'not', 'n\'t', 'one',
  // Pronouns and auxiliaries the general list leaves out but that every speaker uses.
  'us', 'me', 'my', 'mine', 'myself', 'our', 'ours', 'you', 'your', 'yours', 'him', 'her', 'hers',
  'them', 'their', 'theirs', 'it', 'its', 'got', 'getting', 'gets', 'lots', 'way',
];

const STOP = new Set<string>([...eng, ...SPOKEN_FILLERS]);

/** True for a lower-case lemma that carries no topic (the flag stored with every token). */
export function isStopWord(lemma: string): boolean {
  return STOP.has(lemma);
}
