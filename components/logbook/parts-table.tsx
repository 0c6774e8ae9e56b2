import type { Parts } from "@/db/queries/designs";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { TOPOLOGY_PARTS, type Topology } from "@/lib/oscillator/design";
import { partUnitOrBlank } from "@/components/logbook/part-unit";
import { DASH, formatPartValue, formatPercent } from "@/lib/format/numbers";

function tempco(ppm: number | undefined, spread: number | undefined): string {
  if (ppm === undefined && !spread) return DASH;
  const nominal = ppm ?? 0;
  const text = `${nominal > 0 ? "+" : nominal < 0 ? "\u2212" : ""}${Math.abs(nominal)}`;
  return spread ? `${text} ± ${spread} ppm/K` : `${text} ppm/K`;
}

export interface PartsTableProps {
  topology: Topology;
  parts: Parts;
  /** Design values to compare with (for a build's as-built values): changed parts are marked. */
  compareWith?: Parts;
  caption: string;
  /** A narrow column (a sidebar): no descriptions and no tempco. */
  compact?: boolean;
}

/** Part values with tolerance and tempco; with `compareWith`, parts that differ from the design are marked. */
export function PartsTable({ topology, parts, compareWith, caption, compact = false }: PartsTableProps) {
  const roles = TOPOLOGY_PARTS[topology];
  const refs = Object.keys(roles).filter((ref) => parts[ref] !== undefined);
  return (
    <Table caption={caption}>
      <thead>
        <tr>
          <Th>Part</Th>
          <Th className="text-right">Value</Th>
          <Th className="text-right">Tolerance</Th>
          {compact ? null : <Th className="hidden text-right sm:table-cell">Tempco</Th>}
          {compareWith ? <Th className="text-right">Design</Th> : null}
        </tr>
      </thead>
      <tbody>
        {refs.map((ref) => {
          const p = parts[ref];
          const unit = partUnitOrBlank(topology, ref);
          const designValue = compareWith?.[ref]?.valueSi;
          const changed = compareWith !== undefined && designValue !== undefined && designValue !== p.valueSi;
          return (
            <Tr key={ref}>
              <Td>
                <span className="font-mono font-semibold">{ref}</span>{" "}
                {compact ? null : <span className="hidden text-xs text-ink-faint md:inline">{roles[ref].description}</span>}
              </Td>
              <Td numeric className="whitespace-nowrap">
                {formatPartValue(p.valueSi, unit)}
                {changed ? (
                  <span className="ml-1 font-sans text-[11px] font-semibold text-copper" title="Changed by a tweak">
                    <span aria-hidden="true">●</span>
                    <span className="sr-only">(changed by a tweak)</span>
                  </span>
                ) : null}
              </Td>
              <Td numeric className="whitespace-nowrap">{p.tolerance ? `± ${formatPercent(p.tolerance * 100, 2)}` : DASH}</Td>
              {compact ? null : (
                <Td numeric className="hidden whitespace-nowrap sm:table-cell">
                  {tempco(p.tempcoPpmPerK, p.tempcoSpreadPpmPerK)}
                </Td>
              )}
              {compareWith ? <Td numeric className="whitespace-nowrap">{formatPartValue(designValue, unit)}</Td> : null}
            </Tr>
          );
        })}
      </tbody>
    </Table>
  );
}
