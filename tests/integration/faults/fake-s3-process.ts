// A fake S3 of the fault tests' own, in its own process, so "storage goes down" can be a real crash (SIGKILL:
// open sockets reset mid-request, as when the storage host dies) and "storage comes back" a restart on the same
// port and directory, with the buckets and objects it held.
import { spawn, type ChildProcess } from "node:child_process";
import net from "node:net";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "../../..");

/** A free loopback port (bound once and released, then handed to the child). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

function listening(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ host: "127.0.0.1", port }, () => {
      socket.destroy();
      resolve(true);
    });
    socket.on("error", () => resolve(false));
  });
}

export interface FakeS3Process {
  endpoint: string;
  /** Kills the server at once (SIGKILL), like a storage host that dies. */
  crash(): Promise<void>;
  /** Starts it again on the same port and directory. */
  restart(): Promise<void>;
  /** Stops it for good (after the tests). */
  stop(): Promise<void>;
}

/** Starts fake-s3/main.ts on `port`, keeping its objects in `directory`, with `bucket` created on start. */
export async function startFakeS3Process(port: number, directory: string, bucket: string): Promise<FakeS3Process> {
  let child: ChildProcess | null = null;

  async function start(): Promise<void> {
    const c = spawn(
      process.execPath,
      ["--import", "tsx", "fake-s3/main.ts", "--port", String(port), "--dir", directory, "--bucket", bucket, "--origin", "http://127.0.0.1:3100"],
      { cwd: root, env: process.env, stdio: ["ignore", "ignore", "pipe"] },
    );
    let stderr = "";
    c.stderr?.on("data", (chunk: Buffer) => (stderr += chunk.toString()));
    child = c;
    const until = Date.now() + 20_000;
    while (!(await listening(port))) {
      if (c.exitCode !== null) throw new Error(`fake S3 exited with ${c.exitCode}: ${stderr.trim()}`);
      if (Date.now() > until) throw new Error(`fake S3 did not listen on ${port} within 20 s`);
      await new Promise((r) => setTimeout(r, 100));
    }
  }

  async function kill(signal: NodeJS.Signals): Promise<void> {
    const c = child;
    child = null;
    if (!c || c.exitCode !== null || c.signalCode !== null) return;
    const exited = new Promise<void>((resolve) => c.once("exit", () => resolve()));
    c.kill(signal);
    await exited;
  }

  await start();
  return {
    endpoint: `http://127.0.0.1:${port}`,
    crash: () => kill("SIGKILL"),
    restart: start,
    stop: () => kill("SIGTERM"),
  };
}
