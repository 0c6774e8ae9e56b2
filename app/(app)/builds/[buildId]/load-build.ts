import { cache } from "react";
import { getBuild } from "@/db/queries/builds";

// The layout, the title and the pages read the same build: one query per request.
export const loadBuild = cache(getBuild);
