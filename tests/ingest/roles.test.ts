import { describe, expect, test } from 'vitest';
import { roleOf } from '../../src/ingest/roles.js';

describe('roleOf', () => {
  test.each(['Interviewer', 'interviewer', 'INTERVIEWER', 'Int', 'INT', 'I', 'i', 'Q', 'IV', 'Moderator', 'Facilitator', 'Researcher', 'Interviewer 1', 'Interviewer 2', 'I1', 'Moderator 2'])(
    '%s is the interviewer',
    (s) => expect(roleOf(s, [])).toBe('interviewer'),
  );

  test.each(['P1', 'P', 'R1', 'Participant', 'Anna', 'Interviewee', 'Internal', 'Nurse'])('%s is a participant', (s) => {
    expect(roleOf(s, [])).toBe('participant');
  });

  test('no speaker is a participant', () => {
    expect(roleOf(null, [])).toBe('participant');
    expect(roleOf(null, ['Anna'])).toBe('participant');
  });

  test('names given as interviewers count, without regard to case or spaces', () => {
    expect(roleOf('Anna', ['anna'])).toBe('interviewer');
    expect(roleOf('Dr. Quell', [' Dr. Quell '])).toBe('interviewer');
    expect(roleOf('Anna', ['Bea'])).toBe('participant');
    expect(roleOf('Interviewer', ['Bea'])).toBe('interviewer');
  });
});
