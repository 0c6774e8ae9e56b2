import { appendFile, mkdir, readFile, writeFile } from "node:fs/promises";
import path from "node:path";
import type { HeldMessage } from "../lib/mail/held-message";

/**
 * Held messages in memory, mirrored to a JSON-lines file so they survive a restart.
 * Writes are chained so lines never interleave and a clear cannot race an append.
 */
export class MessageStore {
  private messages: HeldMessage[] = [];
  private writes: Promise<void> = Promise.resolve();

  private constructor(private readonly file: string) {}

  /** Open (or create) the store in `directory`, loading what an earlier run kept. */
  static async open(directory: string): Promise<MessageStore> {
    await mkdir(directory, { recursive: true });
    const store = new MessageStore(path.join(directory, "messages.jsonl"));
    let content = "";
    try {
      content = await readFile(store.file, "utf8");
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== "ENOENT") throw err;
    }
    for (const line of content.split("\n")) {
      if (line.trim() === "") continue;
      try {
        store.messages.push(JSON.parse(line) as HeldMessage);
      } catch {
        // A line torn by a crash mid-write is dropped rather than refusing to start.
      }
    }
    return store;
  }

  /** Newest first, optionally only those sent to `to` (case-insensitive address match). */
  list(to?: string): HeldMessage[] {
    const wanted = to?.trim().toLowerCase();
    const picked = wanted ? this.messages.filter((m) => m.to.some((a) => a.toLowerCase() === wanted)) : this.messages;
    return [...picked].reverse();
  }

  get(id: string): HeldMessage | undefined {
    return this.messages.find((m) => m.id === id);
  }

  add(message: HeldMessage): Promise<void> {
    this.messages.push(message);
    return this.enqueue(() => appendFile(this.file, `${JSON.stringify(message)}\n`, "utf8"));
  }

  clear(): Promise<void> {
    this.messages = [];
    return this.enqueue(() => writeFile(this.file, "", "utf8"));
  }

  /** Resolves once every write queued so far is on disk. */
  flush(): Promise<void> {
    return this.writes;
  }

  private enqueue(write: () => Promise<void>): Promise<void> {
    const next = this.writes.then(write);
    // Keep the chain alive after a failed write; the caller still sees the failure.
    this.writes = next.catch(() => undefined);
    return next;
  }
}
