/** The order a review session goes through its passages in (pure). */
import type { ReviewItem } from './order.js';

/**
 * Where the session stands (pure): the queue in order, a cursor, passages decided or deferred
 * this session, and passages to show again first (after an undo).
 */
export class ReviewQueue {
  private cursor = -1;
  private readonly revisits: ReviewItem[] = [];
  readonly deferred = new Set<string>();
  readonly done = new Set<string>();
  readonly closed = new Set<string>();
  private readonly index: Map<string, number>;

  constructor(readonly items: ReviewItem[]) {
    this.index = new Map(items.map((it, i) => [it.passageId, i]));
  }

  /**
   * Adds passages after the last one (a queue given in parts: they follow it in its order).
   * Where the session stands and what it has handled stay; a passage already in it is left out.
   */
  add(items: readonly ReviewItem[]): void {
    // A cursor that ran past the end comes back to it, so that next() goes on with the new ones.
    if (this.cursor >= this.items.length) this.cursor = this.items.length - 1;
    for (const it of items) {
      if (this.index.has(it.passageId)) continue;
      this.index.set(it.passageId, this.items.length);
      this.items.push(it);
    }
  }

  get total(): number {
    return this.items.length;
  }

  /** Passages not yet decided, deferred or found closed this session. */
  get remaining(): number {
    let n = 0;
    for (const it of this.items) if (!this.handled(it.passageId)) n++;
    return n;
  }

  /** 1-based position in the queue of a passage, or null when it came from outside it. */
  positionOf(passageId: string): number | null {
    const i = this.index.get(passageId);
    return i === undefined ? null : i + 1;
  }

  item(passageId: string): ReviewItem | undefined {
    const i = this.index.get(passageId);
    return i === undefined ? undefined : this.items[i];
  }

  private handled(id: string): boolean {
    return this.done.has(id) || this.deferred.has(id) || this.closed.has(id);
  }

  /** Show this passage next, before the queue goes on (going back to it after an undo). */
  revisit(item: ReviewItem): void {
    this.done.delete(item.passageId);
    this.deferred.delete(item.passageId);
    this.closed.delete(item.passageId);
    this.revisits.push(item);
  }

  /** The next passage to show: a revisit first, else the next one in order not handled yet. */
  next(): ReviewItem | undefined {
    while (this.revisits.length) {
      const it = this.revisits.pop()!;
      if (!this.handled(it.passageId)) return it;
    }
    while (++this.cursor < this.items.length) {
      const it = this.items[this.cursor]!;
      if (!this.handled(it.passageId)) return it;
    }
    this.cursor = this.items.length;
    return undefined;
  }
}
