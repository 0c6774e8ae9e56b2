import { CreatePanel } from "@/components/logbook/create-panel";
import { TweakForm } from "@/components/logbook/tweak-form";
import { UploadForm } from "@/components/logbook/upload-form";
import type { TweakChoice } from "@/components/logbook/upload-types";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import type { Parts } from "@/db/queries/designs";
import { uploadLimitBytes } from "@/lib/logbook/capture-files";
import type { Topology, WindingSense } from "@/lib/oscillator/design";
import { cancelUploadAction, createTweakAction, registerRunAction, requestCaptureUploadAction } from "./actions";

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
}

/** The upload form and the tweak form of a build, only for the roles that may use them (the server checks again). */
export function BuildActions(props: BuildActionsProps) {
  const { buildId, canTweak, canUpload } = props;
  if (!canTweak && !canUpload) return null;
  return (
    <>
      {canUpload ? (
        <Card>
          <CardHeader title="Upload a capture" description="After each tweak: export the scope's record as CSV and drop it here." />
          <CardBody>
            <UploadForm
              buildId={buildId}
              tweaks={props.tweaks}
              defaultTweakId={props.defaultTweakId}
              requestUpload={requestCaptureUploadAction}
              registerRun={registerRunAction}
              cancelUpload={cancelUploadAction}
              maxBytes={uploadLimitBytes()}
            />
          </CardBody>
        </Card>
      ) : null}
      {canTweak ? (
        <CreatePanel title="Log a tweak">
          <TweakForm
            action={createTweakAction.bind(null, buildId)}
            topology={props.topology}
            asBuilt={props.asBuilt}
            extraCapacitanceF={props.extraCapacitanceF}
            windings={props.windings}
          />
        </CreatePanel>
      ) : null}
    </>
  );
}
