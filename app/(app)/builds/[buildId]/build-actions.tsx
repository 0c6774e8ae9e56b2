import { CreatePanel } from "@/components/logbook/create-panel";
import type { TweakChoice } from "@/components/logbook/upload-types";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import type { Parts } from "@/db/queries/designs";
import type { Topology, WindingSense } from "@/lib/oscillator/design";

export interface BuildActionsProps {
  buildId: string;
  canTweak: boolean;
  canUpload: boolean;
  topology: Topology;
  asBuilt: Parts;
  extraCapacitanceF: number | null;
  windings: WindingSense | null;
  tweaks: TweakChoice[];
  defaultTweakId: string | null;
  tweakCount: number;
}

/**
 * The upload form and the tweak form of a build, for the roles that may use them. Wired to the logbook's server
 * actions as they land; until then the cards say what will be here.
 */
export function BuildActions({ canTweak, canUpload }: BuildActionsProps) {
  if (!canTweak && !canUpload) return null;
  return (
    <>
      {canUpload ? (
        <Card>
          <CardHeader title="Upload a capture" />
          <CardBody>
            <p className="text-sm text-ink-soft">The upload form appears here once the server side of uploads is in place.</p>
          </CardBody>
        </Card>
      ) : null}
      {canTweak ? (
        <CreatePanel title="Log a tweak">
          <p className="text-sm text-ink-soft">The tweak form appears here once the server side of tweaks is in place.</p>
        </CreatePanel>
      ) : null}
    </>
  );
}
