// A small seeded generator for the fuzz campaign: the same seed gives the same inputs in the same order on any
// machine, so a failing input can be replayed by its seed and index alone.

/** mulberry32: a 32-bit state, full period, good enough to pick inputs (not for anything secret). */
export class Random {
  private state: number;

  constructor(seed: number) {
    this.state = seed >>> 0;
  }

  /** A float in [0, 1). */
  next(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** An integer in [min, max]. */
  int(min: number, max: number): number {
    return min + Math.floor(this.next() * (max - min + 1));
  }

  bool(p = 0.5): boolean {
    return this.next() < p;
  }

  pick<T>(items: readonly T[]): T {
    return items[Math.floor(this.next() * items.length)];
  }

  /** Picks by weight: `[[3, a], [1, b]]` gives a three times in four. */
  weighted<T>(choices: readonly (readonly [number, T])[]): T {
    const total = choices.reduce((s, [w]) => s + w, 0);
    let at = this.next() * total;
    for (const [w, v] of choices) {
      at -= w;
      if (at < 0) return v;
    }
    return choices[choices.length - 1][1];
  }

  /** A string of `length` UTF-16 code units drawn from `alphabet`, or from all of U+0000–U+FFFF when omitted. */
  string(length: number, alphabet?: string): string {
    let out = "";
    for (let i = 0; i < length; i++) out += alphabet ? alphabet[Math.floor(this.next() * alphabet.length)] : String.fromCharCode(this.int(0, 0xffff));
    return out;
  }

  bytes(length: number): Buffer {
    const b = Buffer.alloc(length);
    for (let i = 0; i < length; i++) b[i] = this.int(0, 255);
    return b;
  }

  /** A new generator whose sequence depends only on this one's next draw (for per-input streams). */
  fork(): Random {
    return new Random(Math.floor(this.next() * 4294967296));
  }
}
