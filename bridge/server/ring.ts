/**
 * Fixed-capacity ring buffer: the bridge runs all day, so every in-memory history it keeps has a
 * hard bound and overwrites its oldest entry instead of growing.
 */
export class Ring<T> {
  private readonly items: (T | undefined)[];
  private start = 0;
  private count = 0;

  constructor(readonly capacity: number) {
    if (!Number.isInteger(capacity) || capacity < 1) throw new RangeError(`ring capacity ${capacity} must be a positive integer`);
    this.items = new Array<T | undefined>(capacity);
  }

  get length(): number {
    return this.count;
  }

  push(item: T): void {
    const end = (this.start + this.count) % this.capacity;
    this.items[end] = item;
    if (this.count < this.capacity) this.count++;
    else this.start = (this.start + 1) % this.capacity;
  }

  /** Oldest item, or undefined when empty. */
  peek(): T | undefined {
    return this.count ? this.items[this.start] : undefined;
  }

  /** Removes and returns the oldest item. */
  shift(): T | undefined {
    if (!this.count) return undefined;
    const item = this.items[this.start];
    this.items[this.start] = undefined;
    this.start = (this.start + 1) % this.capacity;
    this.count--;
    return item;
  }

  /** Drops oldest items while `stale(item)` holds. */
  dropWhile(stale: (item: T) => boolean): void {
    while (this.count && stale(this.items[this.start] as T)) this.shift();
  }

  clear(): void {
    this.items.fill(undefined);
    this.start = 0;
    this.count = 0;
  }

  /** Oldest first. */
  toArray(): T[] {
    const out: T[] = new Array(this.count);
    for (let i = 0; i < this.count; i++) out[i] = this.items[(this.start + i) % this.capacity] as T;
    return out;
  }
}
