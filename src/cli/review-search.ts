/** The type-ahead search over theme paths used to re-code a passage (pure). */

export interface ThemeEntry {
  id: string;
  path: string;
  name: string;
}

/**
 * Themes matching what has been typed: every word of the query must occur in the path (case
 * ignored). Themes whose own name starts with the query come first, then those with any level
 * starting with the first word, then the rest; template order within each group, so the list
 * does not jump about as letters are typed.
 */
export function matchThemes(entries: ThemeEntry[], query: string): ThemeEntry[] {
  const q = query.trim().toLowerCase();
  if (!q) return entries;
  const words = q.split(/\s+/);
  const scored: { e: ThemeEntry; score: number; i: number }[] = [];
  entries.forEach((e, i) => {
    const path = e.path.toLowerCase();
    if (!words.every((w) => path.includes(w))) return;
    const name = e.name.toLowerCase();
    const levels = path.split(' > ');
    const score = name.startsWith(q) ? 0 : levels.some((l) => l.startsWith(words[0]!) || l.includes(' ' + words[0]!)) ? 1 : 2;
    scored.push({ e, score, i });
  });
  return scored.sort((a, b) => a.score - b.score || a.i - b.i).map((s) => s.e);
}
