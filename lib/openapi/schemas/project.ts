import { z } from "zod";
import { documented } from "../documented";
import { isoTime, nullableIsoTime, pageOf, rowId, userId } from "./common";

const projectShape = {
  id: rowId,
  name: z.string(),
  purpose: z.string(),
  ownerId: userId,
  ownerName: z.string(),
  createdAt: isoTime,
  updatedAt: isoTime,
};

export const projectSchema = documented(z.object(projectShape), { refId: "Project" });

/** A project as the list shows it: with its counts. */
export const projectListItemSchema = documented(
  z.object({
    ...projectShape,
    designCount: z.int(),
    buildCount: z.int(),
    runCount: z.int(),
    lastRunAt: nullableIsoTime,
  }),
  { refId: "ProjectListItem" },
);

export const projectPageSchema = pageOf(projectListItemSchema, "ProjectPage");
