import { cache } from "react";
import { getRun } from "@/db/queries/runs";

// The layout, the title and the page read the same run: one query per request.
export const loadRun = cache(getRun);
