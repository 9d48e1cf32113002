import { describe, expect, it } from 'vitest';
import { collectComments } from '../../src/template/comments.js';
import { assignIds } from '../../src/template/diff.js';
import { renameTheme, retireTheme, moveTheme } from '../../src/template/ops.js';
import { parseOutlineOrThrow } from '../../src/template/parse.js';
import { findByPath } from '../../src/template/paths.js';
import { printOutline } from '../../src/template/print.js';

const TEXT = `# Template after the first four interviews
# (team meeting, week 3)
Workload [a priori]  # from the brief
  | seeds: busy, time
  # keep apart from staffing for now
  Interruptions
  Staffing levels
# safety came up in every interview
Patient safety
  Allergies  # the banner problem
# end of template
`;

function recorded() {
  let n = 0;
  const { template } = assignIds(parseOutlineOrThrow(TEXT, 't.txt').template, null, () => `T${++n}`);
  return template;
}

describe('comments survive the rewrites trellis makes', () => {
  it('prints an unchanged template with every comment where it was', () => {
    const t = recorded();
    expect(printOutline(t, collectComments(TEXT, t))).toBe(TEXT);
  });

  it('a comment follows its theme through rename and move; a retired theme\'s comment is kept at the end', () => {
    const t = recorded();
    const comments = collectComments(TEXT, t);
    let r = renameTheme(t, findByPath(t, 'Interruptions').id, 'Being interrupted').template;
    r = moveTheme(r, findByPath(r, 'Allergies').id, null).template;
    r = retireTheme(r, findByPath(r, 'Patient safety').id).template;
    const text = printOutline(r, comments);
    expect(text).toBe(`# Template after the first four interviews
# (team meeting, week 3)
Workload [a priori]  # from the brief
  | seeds: busy, time
  # keep apart from staffing for now
  Being interrupted
  Staffing levels
Allergies  # the banner problem
# Comments kept from themes no longer in the template:
# safety came up in every interview
# end of template
`);
    // And the result reads back to the same themes.
    expect(parseOutlineOrThrow(text, 'x').template.roots.map((n) => n.name)).toEqual(['Workload', 'Allergies']);
  });

  it('carries nothing when the text and the tree do not line up', () => {
    const t = recorded();
    const c = collectComments('# a\nOnly one theme\n', t);
    expect(c.header).toEqual([]);
    expect(c.before.size).toBe(0);
  });
});
