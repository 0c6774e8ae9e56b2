import { checkDatabase } from "@/db/queries/health";
import { checkStorage } from "@/lib/storage";
import { checkMail } from "@/lib/mail";

export const dynamic = "force-dynamic";

/** Liveness of every part the app needs; 503 with the reason for each part that is not ok. */
export async function GET() {
  const [dbState, storageState, mailState] = await Promise.all([checkDatabase(), checkStorage(), checkMail()]);
  const parts = {
    db: dbState.ok ? "ok" : dbState.error,
    storage: storageState.ok ? "ok" : storageState.error,
    mail: mailState.ok ? "ok" : mailState.error,
  };
  const ok = dbState.ok && storageState.ok && mailState.ok;
  return Response.json({ ok, ...parts }, { status: ok ? 200 : 503, headers: { "cache-control": "no-store" } });
}
