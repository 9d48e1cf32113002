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

/**
 * Function words the general list leaves out: wh-words, conjunctions, prepositions, pronouns,
 * quantifiers, adverbs of time, frequency and degree, number words and titles. They say nothing
 * about a theme, and a researcher reading "distinctive terms: when, yet, often" cannot check them.
 */
export const FUNCTION_WORDS: readonly string[] = [
  'when', 'why', 'even', 'yet', 'ever', 'often', 'once', 'already', 'always', 'sometimes', 'usually', 'whom', 'whose',
  'thus', 'hence', 'however', 'although', 'though', 'whilst', 'unless', 'until', 'upon', 'within', 'without', 'above',
  'again', 'against', 'almost', 'alone', 'along', 'among', 'amongst', 'anyone', 'anything', 'anyway', 'anywhere', 'around',
  'away', 'behind', 'below', 'beneath', 'beside', 'besides', 'beyond', 'cannot', 'does', 'done', 'during', 'either',
  'else', 'elsewhere', 'enough', 'etc', 'every', 'everyone', 'everything', 'everywhere', 'few', 'former', 'further',
  'hers', 'herself', 'indeed', 'itself', 'later', 'latter', 'least', 'less', 'may', 'maybe', 'meanwhile', 'moreover',
  'mostly', 'namely', 'neither', 'nevertheless', 'next', 'nobody', 'none', 'nor', 'nothing', 'nowhere', 'off', 'onto',
  'others', 'otherwise', 'ourselves', 'per', 'perhaps', 'rather', 'seem', 'seemed', 'seems', 'several', 'shall', 'she',
  'somehow', 'someone', 'something', 'somewhere', 'soon', 'thereby', 'therefore', 'throughout', 'together', 'toward',
  'towards', 'unlike', 'via', 'whatever', 'whenever', 'whereas', 'wherever', 'whether', 'whoever', 'yourself',
  'yourselves', 'two', 'three', 'four', 'five', 'six', 'seven', 'eight', 'nine', 'ten', 'eleven', 'twelve', 'twenty',
  'thirty', 'forty', 'fifty', 'hundred', 'thousand', 'million', 'billion', 'third', 'mr.', 'mrs.', 'ms.', 'dr.', 'st.',
  'mr', 'mrs', 'ms', 'nearly', 'also', 'still', 'much', 'many', 'each', 'any', 'all', 'both', 'such', 'same', 'other',
  'another', 'some', 'most', 'more', 'only', 'very', 'too', 'then', 'than', 'there', 'here', 'where', 'how', 'what',
  'which', 'who', 'this', 'that', 'these', 'those', 'he', 'his', 'him', 'himself', 'they', 'we', 'i', 'since', 'while',
  'because', 'if', 'whereby', 'ago', 'thereof', 'ie', 'eg',
];

const STOP = new Set<string>([...eng, ...SPOKEN_FILLERS]);
const FUNCTION = new Set<string>(FUNCTION_WORDS);

/** True for a lemma that is a function word (or a title such as "mr."): never a term. */
export function isFunctionWord(lemma: string): boolean {
  return FUNCTION.has(lemma);
}

/** True for a lower-case lemma that carries no topic (the flag stored with every token). */
export function isStopWord(lemma: string): boolean {
  return STOP.has(lemma);
}
