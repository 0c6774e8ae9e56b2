import type { Metadata } from "next";
import Link from "next/link";
import { Button } from "@/components/ui/button";
import { EmptyState } from "@/components/ui/empty-state";
import { Input, Select } from "@/components/ui/field";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { PageHeader } from "@/components/ui/page-header";
import { listAuditActions, listAuditEvents } from "@/db/queries/audit";
import { listUsers } from "@/db/queries/users";
import { requireUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { refusalMessage } from "@/lib/auth/require-permission";
import { auditFilterSchema } from "@/lib/validations/people";
import { ForbiddenNotice } from "../forbidden-notice";
import { formatUtc } from "../format-time";

export const metadata: Metadata = { title: "Audit log" };

const PAGE_SIZE = 50;

export default async function AuditPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("/audit");
  if (!can(user.role, "audit:read")) return <ForbiddenNotice message={refusalMessage(user.role, "audit:read")} />;
  const raw = await searchParams;
  const filter = auditFilterSchema.parse(Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v || undefined])));
  const to = filter.to ? new Date(Date.parse(filter.to) + 86_400_000) : undefined;
  const [{ events, total }, people, actionNames] = await Promise.all([
    listAuditEvents({
      actorId: filter.actor,
      action: filter.action,
      entityType: filter.entity,
      from: filter.from ? new Date(filter.from) : undefined,
      to,
      limit: PAGE_SIZE,
      offset: (filter.page - 1) * PAGE_SIZE,
    }),
    listUsers(),
    listAuditActions(),
  ]);
  const pages = Math.max(1, Math.ceil(total / PAGE_SIZE));
  const pageLink = (page: number) => {
    const q = new URLSearchParams();
    for (const [k, v] of Object.entries({ actor: filter.actor, action: filter.action, entity: filter.entity, from: filter.from, to: filter.to })) if (v) q.set(k, v);
    q.set("page", String(page));
    return `/audit?${q}`;
  };
  return (
    <>
      <PageHeader title="Audit log" description="Who did what, to which record, when and from where. Newest first." />
      <form method="get" className="mb-4 grid gap-3 rounded-lg border border-rule bg-paper-raised p-3 sm:grid-cols-5 sm:items-end">
        <label className="text-xs font-medium text-ink-soft">
          Person
          <Select name="actor" defaultValue={filter.actor ?? ""} className="mt-1">
            <option value="">anyone</option>
            {people.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
              </option>
            ))}
          </Select>
        </label>
        <label className="text-xs font-medium text-ink-soft">
          Action
          <Select name="action" defaultValue={filter.action ?? ""} className="mt-1">
            <option value="">any</option>
            {actionNames.map((a) => (
              <option key={a} value={a}>
                {a}
              </option>
            ))}
          </Select>
        </label>
        <label className="text-xs font-medium text-ink-soft">
          From (UTC date)
          <Input type="date" name="from" defaultValue={filter.from ?? ""} className="mt-1" />
        </label>
        <label className="text-xs font-medium text-ink-soft">
          To (UTC date, inclusive)
          <Input type="date" name="to" defaultValue={filter.to ?? ""} className="mt-1" />
        </label>
        <div className="flex gap-2">
          <Button type="submit" variant="secondary">
            Filter
          </Button>
          <Link href="/audit" className="self-center text-sm text-copper underline underline-offset-2">
            Clear
          </Link>
        </div>
      </form>
      {events.length === 0 ? (
        <EmptyState title="No events match">Widen the filter, or clear it to see everything.</EmptyState>
      ) : (
        <Table caption="Audit events">
          <thead>
            <tr>
              <Th>When</Th>
              <Th>Who</Th>
              <Th>Action</Th>
              <Th>Record</Th>
              <Th>Detail</Th>
              <Th>From</Th>
            </tr>
          </thead>
          <tbody>
            {events.map((e) => (
              <Tr key={e.id}>
                <Td className="num whitespace-nowrap font-mono text-[13px]">
                  {formatUtc(e.createdAt)}
                </Td>
                <Td>{e.actorName ?? (e.actorId ? e.actorId : <span className="text-ink-faint">anonymous</span>)}</Td>
                <Td className="font-mono text-xs">{e.action}</Td>
                <Td className="text-xs">{e.entityType ? `${e.entityType}${e.entityId ? ` ${e.entityId}` : ""}` : "—"}</Td>
                <Td className="max-w-xs break-words font-mono text-xs">{Object.keys(e.detail).length ? JSON.stringify(e.detail) : ""}</Td>
                <Td className="num font-mono text-xs">{e.ip ?? "—"}</Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      )}
      <nav aria-label="Pages of the audit log" className="mt-3 flex items-center gap-3 text-sm">
        <span className="num text-ink-soft">
          {total} event{total === 1 ? "" : "s"} · page {filter.page} of {pages}
        </span>
        {filter.page > 1 ? <Link href={pageLink(filter.page - 1)} className="text-copper underline underline-offset-2">Newer</Link> : null}
        {filter.page < pages ? <Link href={pageLink(filter.page + 1)} className="text-copper underline underline-offset-2">Older</Link> : null}
      </nav>
    </>
  );
}
