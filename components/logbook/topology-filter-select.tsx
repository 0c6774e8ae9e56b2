import { Select } from "@/components/ui/field";
import { TOPOLOGIES, type Topology } from "@/lib/oscillator/design";
import { TOPOLOGY_NAMES } from "./design-model";

/** A list filter's topology choice: every topology by name, with an empty "any" option first. */
export function TopologyFilterSelect({ id, value, anyLabel }: { id: string; value: Topology | undefined; anyLabel: string }) {
  return (
    <Select id={id} name="topology" defaultValue={value ?? ""}>
      <option value="">{anyLabel}</option>
      {TOPOLOGIES.map((t) => (
        <option key={t} value={t}>
          {TOPOLOGY_NAMES[t]}
        </option>
      ))}
    </Select>
  );
}
