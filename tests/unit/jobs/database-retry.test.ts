import net from "node:net";
import pg from "pg";
import { describe, expect, it } from "vitest";
import { retryWhileDatabaseDown } from "@/lib/jobs/database-retry";

/** A real lost-database error: node-postgres connecting to a loopback port nobody listens on (ECONNREFUSED). */
async function refusedConnectionError(): Promise<Error> {
  const server = net.createServer();
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as net.AddressInfo;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  const client = new pg.Client({ host: "127.0.0.1", port, user: "nobody", database: "nothing" });
  try {
    await client.connect();
  } catch (err) {
    return err as Error;
  }
  await client.end();
  throw new Error("the connection was expected to be refused");
}

const FAST = { firstDelayMs: 5, maxDelayMs: 20 };

describe("retryWhileDatabaseDown", () => {
  it("tries again while the database refuses connections, then returns the result", async () => {
    const refused = await refusedConnectionError();
    const waits: number[] = [];
    let calls = 0;
    const result = await retryWhileDatabaseDown(
      async () => {
        calls++;
        if (calls <= 3) throw refused;
        return "stored";
      },
      { ...FAST, onRetry: (_err, delayMs) => waits.push(delayMs) },
    );
    expect(result).toBe("stored");
    expect(calls).toBe(4);
    // Doubling from the first wait, capped at the longest.
    expect(waits).toEqual([5, 10, 20]);
  });

  it("throws any other error at once, without retrying", async () => {
    let calls = 0;
    const failing = retryWhileDatabaseDown(async () => {
      calls++;
      throw new RangeError("not a database outage");
    }, FAST);
    await expect(failing).rejects.toThrow(RangeError);
    expect(calls).toBe(1);
  });

  it("gives up with the database's error once the time allowed has passed", async () => {
    const refused = await refusedConnectionError();
    let calls = 0;
    const failing = retryWhileDatabaseDown(async () => {
      calls++;
      throw refused;
    }, { ...FAST, giveUpAfterMs: 100 });
    await expect(failing).rejects.toBe(refused);
    // Waits of 5, 10, 20, 20… ms within 100 ms: a few tries, then the error.
    expect(calls).toBeGreaterThan(2);
  });
});
