import { describe, expect, it } from 'vitest';
import { OutlineError, parseOutline, parseOutlineOrThrow } from '../../src/template/index.js';
import { UserError } from '../../src/errors.js';
import { shape } from './helpers.js';

const FILE = 'study/template.txt';

function errorsOf(text: string): string[] {
  return parseOutline(text, FILE).errors.map((e) => e.text);
}

describe('parseOutline: valid outlines', () => {
  const outline = [
    '# Template for the ward staff interviews',
    '',
    'Workload [a priori]   # from the commissioning brief',
    '  | definition: Talk about how much work there is',
    '  | definition: and how it is shared out.',
    '  | include: rotas, overtime, cover for absence',
    '  | exclude: pay, which goes under Reward',
    '  | seeds: rota, overtime,  cover , ',
    '  | seeds: agency staff',
    '  Staffing levels',
    '    Night shifts',
    '      Handover',
    '        Late handover',
    '          | definition: Handover that runs past the end of the shift.',
    '  Admin load [A Priori]',
    '',
    '# a whole-line comment between themes',
    'Wellbeing',
    '  Stress',
    '  Peer support    # added after interview 4',
    'C# and other tools',
  ].join('\n');
  const { template, errors, warnings } = parseOutline(outline, FILE);

  it('has no errors and no warnings', () => {
    expect(errors).toEqual([]);
    expect(warnings).toEqual([]);
  });

  it('nests five levels by two spaces', () => {
    expect(shape(template)).toEqual([
      [
        'Workload',
        [
          ['Staffing levels', [['Night shifts', [['Handover', [['Late handover', []]]]]]]],
          ['Admin load', []],
        ],
      ],
      ['Wellbeing', [['Stress', []], ['Peer support', []]]],
      ['C# and other tools', []],
    ]);
  });

  it('reads a priori marks (any case) and strips them and comments from names', () => {
    const [workload, wellbeing] = template.roots;
    expect(workload!.apriori).toBe(true);
    expect(workload!.children[1]!.apriori).toBe(true);
    expect(workload!.children[0]!.apriori).toBe(false);
    expect(wellbeing!.apriori).toBe(false);
    expect(wellbeing!.children[1]!.name).toBe('Peer support');
  });

  it('joins repeated notes with a space and splits seeds on commas', () => {
    const w = template.roots[0]!;
    expect(w.definition).toBe('Talk about how much work there is and how it is shared out.');
    expect(w.include).toBe('rotas, overtime, cover for absence');
    expect(w.exclude).toBe('pay, which goes under Reward');
    expect(w.seeds).toEqual(['rota', 'overtime', 'cover', 'agency staff']);
    const late = w.children[0]!.children[0]!.children[0]!.children[0]!;
    expect(late.definition).toBe('Handover that runs past the end of the shift.');
    expect(w.children[0]!.definition).toBe('');
  });

  it('records source lines and leaves ids empty', () => {
    const w = template.roots[0]!;
    expect(w.line).toBe(3);
    expect(w.children[0]!.line).toBe(10);
    expect(template.roots[1]!.line).toBe(18);
    expect(w.id).toBe('');
  });

  it('keeps "#" not preceded by whitespace, and "\\#" as a literal', () => {
    const t = parseOutline('Ranked \\#1 concern\n  | definition: the \\#1 worry # comment\n', FILE).template;
    expect(t.roots[0]!.name).toBe('Ranked #1 concern');
    expect(t.roots[0]!.definition).toBe('the #1 worry');
  });

  it('accepts CRLF line ends, a byte-order mark and inner spacing', () => {
    const t = parseOutline('\uFEFFWorkload\r\n  Staffing   levels\r\n', FILE).template;
    expect(shape(t)).toEqual([['Workload', [['Staffing levels', []]]]]);
  });

  it('has unlimited depth', () => {
    const deep = Array.from({ length: 60 }, (_, i) => `${'  '.repeat(i)}Level ${i + 1}`).join('\n');
    let n = parseOutline(deep, FILE).template.roots[0]!;
    let depth = 1;
    while (n.children.length) {
      n = n.children[0]!;
      depth++;
    }
    expect(depth).toBe(60);
    expect(n.name).toBe('Level 60');
  });
});

describe('parseOutline: errors with line numbers', () => {
  it('duplicate siblings, ignoring case, naming the earlier line', () => {
    expect(errorsOf('Workload\n  Staffing\n  Rotas\n  staffing\nStaffing\n')).toEqual([
      `${FILE}:4: duplicate theme "staffing" under "Workload" (first on line 2); sibling names must differ, ignoring case`,
    ]);
    expect(errorsOf('Workload\nWellbeing\nWORKLOAD\n')[0]).toMatch(/:3: duplicate theme "WORKLOAD" at the top level \(first on line 1\)/);
  });

  it('the same name under different parents is fine', () => {
    expect(errorsOf('Workload\n  Other\nWellbeing\n  Other\n')).toEqual([]);
  });

  it('three-space indentation', () => {
    expect(errorsOf('Workload\n   Staffing\n')).toEqual([
      `${FILE}:2: indentation of 3 spaces is not a multiple of two; nest themes by two spaces per level`,
    ]);
  });

  it('tab indentation', () => {
    expect(errorsOf('Workload\n\tStaffing\n')).toEqual([`${FILE}:2: tab in the indentation; indent with two spaces per level`]);
  });

  it('an indented first theme', () => {
    expect(errorsOf('# comment first is fine\n  Workload\n  Staffing\n')).toEqual([
      `${FILE}:2: the first theme is indented; top-level themes start at the beginning of the line`,
    ]);
  });

  it('a level jump, reported once (its own sub-themes are not blamed)', () => {
    expect(errorsOf('Workload\n  Staffing\n      Nights\n        Handover\n')).toEqual([
      `${FILE}:3: indented 2 levels deeper than the theme "Staffing" on line 2; a sub-theme goes one level (two spaces) deeper`,
    ]);
  });

  it('empty names', () => {
    expect(errorsOf('Workload\n  [a priori]\n')).toEqual([`${FILE}:2: empty theme name`]);
  });

  it('names containing the path separators', () => {
    const errs = errorsOf('Workload > Staffing\nPay; reward\nAge>65 is fine\n');
    expect(errs).toHaveLength(2);
    expect(errs[0]).toMatch(/:1: theme name "Workload > Staffing" contains " > "/);
    expect(errs[1]).toMatch(/:2: theme name "Pay; reward" contains ";"/);
  });

  it('bad note lines', () => {
    expect(errorsOf('| definition: before any theme\nWorkload\n')).toEqual([
      `${FILE}:1: note line with no theme above it; a note follows the theme it describes`,
    ]);
    expect(errorsOf('Workload\n  | meaning: work\n')).toEqual([
      `${FILE}:2: unknown note keyword "meaning"; use definition, include, exclude, seeds`,
    ]);
    expect(errorsOf('Workload\n  | just some text\n')).toEqual([
      `${FILE}:2: note line needs a keyword and a colon, such as "| definition: ..."`,
    ]);
    expect(errorsOf('Workload\n  Staffing\n  | definition: meant for Workload\n')).toEqual([
      `${FILE}:3: note line for "Staffing" (line 2) must be indented one level deeper than it, with 4 spaces`,
    ]);
  });

  it('collects every error in one pass', () => {
    const text = 'Workload\n   Odd\n\tTabbed\n  Staffing\n  staffing\n  | colour: red\n';
    const lines = parseOutline(text, FILE).errors.map((e) => e.line);
    expect(lines).toEqual([2, 3, 5, 6]);
  });

  it('parseOutlineOrThrow throws one UserError listing all problems', () => {
    const text = 'Workload\n   Odd\n  Staffing\n  staffing\n';
    let caught: unknown;
    try {
      parseOutlineOrThrow(text, FILE);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(UserError);
    expect(caught).toBeInstanceOf(OutlineError);
    const err = caught as OutlineError;
    expect(err.file).toBe(FILE);
    expect(err.line).toBe(2);
    expect(err.problems.map((p) => p.line)).toEqual([2, 4]);
    expect(err.message.split('\n')).toEqual([
      '2 problems in the outline:',
      `  ${FILE}:2: indentation of 3 spaces is not a multiple of two; nest themes by two spaces per level`,
      `  ${FILE}:4: duplicate theme "staffing" under "Workload" (first on line 3); sibling names must differ, ignoring case`,
    ]);
  });

  it('a single problem is thrown as itself, with file and line', () => {
    expect(() => parseOutlineOrThrow('Workload\n\tStaffing\n', FILE)).toThrow(
      expect.objectContaining({ line: 2, file: FILE, message: 'tab in the indentation; indent with two spaces per level' }),
    );
  });
});

describe('parseOutline: warnings', () => {
  it('warns when more than half of the themes are a priori', () => {
    const { errors, warnings, template } = parseOutline('Workload [a priori]\n  Staffing [a priori]\nWellbeing\n', FILE);
    expect(errors).toEqual([]);
    expect(template.roots[0]!.apriori).toBe(true);
    expect(warnings.map((w) => w.text)).toEqual([
      `${FILE}: 2 of 3 themes are a priori; common practice: a priori themes are few and tentative; the template grows mainly from the data`,
    ]);
  });

  it('does not warn at exactly half', () => {
    expect(parseOutline('Workload [a priori]\nWellbeing\n', FILE).warnings).toEqual([]);
  });

  it('warns about an outline with no themes, without failing', () => {
    const r = parseOutline('# nothing yet\n\n', FILE);
    expect(r.errors).toEqual([]);
    expect(r.template.roots).toEqual([]);
    expect(r.warnings.map((w) => w.message)).toEqual(['the outline has no themes']);
  });
});
