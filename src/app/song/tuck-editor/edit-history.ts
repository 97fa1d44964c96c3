/**
 * Undo and redo over immutable snapshots. `push` records a new state and
 * forgets the redo branch; consecutive pushes with the same `mergeKey`
 * (one drag, one run of arrow presses) collapse into one step.
 */
export class EditHistory<T> {
  private past: T[] = [];
  private future: T[] = [];
  private lastKey: string | null = null;

  constructor(private present: T, private readonly limit = 200) {}

  get current(): T {
    return this.present;
  }
  get canUndo(): boolean {
    return this.past.length > 0;
  }
  get canRedo(): boolean {
    return this.future.length > 0;
  }

  push(next: T, mergeKey: string | null = null): void {
    if (next === this.present) return;
    if (mergeKey === null || mergeKey !== this.lastKey) {
      this.past.push(this.present);
      if (this.past.length > this.limit) this.past.shift();
    }
    this.present = next;
    this.future = [];
    this.lastKey = mergeKey;
  }

  /** Ends a run of merged edits, so the next edit is its own step. */
  seal(): void {
    this.lastKey = null;
  }

  undo(): T {
    const prev = this.past.pop();
    if (prev !== undefined) {
      this.future.push(this.present);
      this.present = prev;
    }
    this.lastKey = null;
    return this.present;
  }

  redo(): T {
    const next = this.future.pop();
    if (next !== undefined) {
      this.past.push(this.present);
      this.present = next;
    }
    this.lastKey = null;
    return this.present;
  }

  /** Starts over from a saved state (after loading or saving). */
  reset(state: T): void {
    this.past = [];
    this.future = [];
    this.present = state;
    this.lastKey = null;
  }
}
