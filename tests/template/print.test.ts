import { describe, expect, it } from 'vitest';
import { addTheme, parseOutline, parseOutlineOrThrow, printOutline, type Template } from '../../src/template/index.js';
import { counter, revision, strip } from './helpers.js';

const roundTrip = (t: Template) => {
  const again = parseOutline(printOutline(t), 'printed.txt');
  expect(again.errors).toEqual([]);
  return again.template;
};

describe('printOutline', () => {
  it('prints themes, a priori marks and notes in the outline format', () => {
    const t = parseOutlineOrThrow(
      [
        'Workload [a priori]  # a comment is not kept',
        '  | seeds: rota, overtime',
        '  | definition: How much work there is.',
        '  Staffing levels',
        '    | exclude: pay',
        'Wellbeing',
      ].join('\n'),
      'template.txt',
    ).template;
    expect(printOutline(t)).toBe(
      [
        'Workload [a priori]',
        '  | definition: How much work there is.',
        '  | seeds: rota, overtime',
        '  Staffing levels',
        '    | exclude: pay',
        'Wellbeing',
        '',
      ].join('\n'),
    );
  });

  it('prints an empty template as an empty file', () => {
    expect(printOutline({ roots: [] })).toBe('');
  });

  it('round-trips a deep template with notes, seeds and a priori marks', () => {
    const text = [
      'Workload [a priori]',
      '  | definition: Talk about how much work there is and how it is shared out between the',
      '  | definition: members of a team, including cover for absence and the use of agency staff.',
      '  | include: rotas, overtime',
      '  | exclude: pay, which goes under Reward',
      '  | seeds: rota, overtime, cover, agency staff, bank shifts, skill mix, caseload, waiting list',
      '  | seeds: handover, breaks, sickness absence, vacancies',
      '  Staffing levels [a priori]',
      '    Night shifts',
      '      Handover',
      '        Late handover',
      '          | definition: Handover that runs past the end of the shift; the \\#1 complaint.',
      '          | seeds: \\#handover, late',
      'Wellbeing',
      '  Stress',
      '  Peer support',
      '\\#hashtags in survey answers',
    ].join('\n');
    const t = parseOutlineOrThrow(text, 'template.txt').template;
    const printed = printOutline(t);
    const back = roundTrip(t);
    expect(strip(back)).toEqual(strip(t));
    // Long notes wrap over several lines, each within the width.
    expect(printed.split('\n').filter((l) => l.includes('| definition:')).length).toBeGreaterThanOrEqual(3);
    expect(Math.max(...printed.split('\n').map((l) => l.length))).toBeLessThanOrEqual(88);
    expect(back.roots[2]!.name).toBe('#hashtags in survey answers');
    expect(back.roots[0]!.children[0]!.children[0]!.children[0]!.children[0]!.seeds).toEqual(['#handover', 'late']);
    // Printing is stable.
    expect(printOutline(back)).toBe(printed);
  });

  it('round-trips themes made by operations, with text that needs escaping or tidying', () => {
    const t0 = revision('Workload\n');
    const { template } = addTheme(t0, t0.roots[0]!.id, 'Tools # and kit', counter('n'), {
      apriori: true,
      definition: '  Mentions of\n equipment:   #1 is the hoist  ',
      seeds: ['hoist', ' #kit '],
    });
    const node = template.roots[0]!.children[0]!;
    expect(node.definition).toBe('Mentions of equipment: #1 is the hoist');
    expect(strip(roundTrip(template))).toEqual(strip(template));
  });

  it('keeps a very long word on a line of its own rather than breaking it', () => {
    const t = revision(`Workload\n  | definition: ${'x'.repeat(120)} short words after it\n`);
    const lines = printOutline(t).split('\n');
    expect(lines[1]).toBe(`  | definition: ${'x'.repeat(120)}`);
    expect(strip(roundTrip(t))).toEqual(strip(t));
  });
});
