import type { Change } from './types.js';

/** A revision change as one readable line, for history listings and reports. */
export function describeChange(c: Change): string {
  switch (c.kind) {
    case 'added':
      return `added    ${c.path}`;
    case 'removed':
      return `removed  ${c.path} (retired; its history is kept)`;
    case 'renamed':
      return `renamed  ${c.from} -> ${c.to}`;
    case 'moved':
      return `moved    ${c.from} -> ${c.to}`;
    case 'merged':
      return `merged   ${c.from} into ${c.to}`;
    case 'split':
      return `split    ${c.path} into ${c.into.join(', ')}`;
    case 'retired':
      return `retired  ${c.path}`;
    case 'revived':
      return `revived  ${c.path} (a retired theme: its codings return)`;
    case 'edited':
      return `edited   ${c.path} (${c.fields.join(', ')})`;
  }
}
