import { checkDatabase } from "@/db/queries/health";
import { checkStorage } from "@/lib/storage";
import { checkMail } from "@/lib/mail";

export const dynamic = "force-dynamic";

type Probe = () => Promise<{ ok: true } | { ok: false; error: string }>;

/**
 * How long an answer of the storage and mail probes is reused. Each probe opens a connection to another service
 * (the SMTP greeting alone takes 100 ms on the fake server, and real servers pause longer on purpose), so probing
 * on every request made the health check slow and let anyone make the app open SMTP sessions at will.
 */
const SHARED_PROBE_MS = 5_000;

/** One probe in flight at a time, its answer reused for SHARED_PROBE_MS. */
function shared(probe: Probe): Probe {
  let last: { at: number; answer: ReturnType<Probe> } | null = null;
  return () => {
    if (!last || Date.now() - last.at > SHARED_PROBE_MS) last = { at: Date.now(), answer: probe() };
    return last.answer;
  };
}

const storageProbe = shared(checkStorage);
const mailProbe = shared(checkMail);

/**
 * Liveness of every part the app needs; 503 with the reason for each part that is not ok. The database is
 * asked on every request (one query on the app's own pool); storage and mail answers are at most 5 s old.
 */
export async function GET() {
  const [dbState, storageState, mailState] = await Promise.all([checkDatabase(), storageProbe(), mailProbe()]);
  const parts = {
    db: dbState.ok ? "ok" : dbState.error,
    storage: storageState.ok ? "ok" : storageState.error,
    mail: mailState.ok ? "ok" : mailState.error,
  };
  const ok = dbState.ok && storageState.ok && mailState.ok;
  return Response.json({ ok, ...parts }, { status: ok ? 200 : 503, headers: { "cache-control": "no-store" } });
}
