/** Who is speaking: the interviewer side or the participant side of a transcript. */

export type Role = 'interviewer' | 'participant';

/**
 * Labels that conventionally mark the interviewer: Interviewer, Int, INT, IV, I, Q, Moderator,
 * Facilitator, Researcher, each optionally numbered ("Interviewer 2", "I1").
 */
const INTERVIEWER = /^(?:interviewer|int|iv|i|q|moderator|facilitator|researcher)(?:[ \t]*#?\d{1,2})?$/i;

/**
 * The role of a speaker. `interviewers` lists extra names that are the interviewer in this study
 * (matched without regard to case or surrounding spaces). No speaker (null) is a participant.
 */
export function roleOf(speaker: string | null, interviewers: readonly string[] = []): Role {
  if (speaker === null) return 'participant';
  const s = speaker.trim().replace(/[:.]+$/, '').trim();
  if (INTERVIEWER.test(s)) return 'interviewer';
  const key = s.toLowerCase();
  return interviewers.some((n) => n.trim().toLowerCase() === key) ? 'interviewer' : 'participant';
}
