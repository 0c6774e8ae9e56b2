import { describe, expect, it } from "vitest";
import { constructionKey, constructionName, constructionOf, parseConstruction } from "@/lib/layouts/construction";

describe("constructionKey", () => {
  it("a_pcb_carries_its_revision_in_lower_case", () => {
    expect(constructionKey({ kind: "pcb", revision: " Rev B " })).toBe("pcb:rev b");
    expect(constructionKey({ kind: "pcb", revision: "" })).toBe("pcb");
  });

  it("other_kinds_ignore_a_revision", () => {
    expect(constructionKey({ kind: "breadboard", revision: "rev B" })).toBe("breadboard");
    expect(constructionOf("perfboard", "v2")).toEqual({ kind: "perfboard", revision: "" });
  });
});

describe("parseConstruction", () => {
  it("reads_back_every_key", () => {
    expect(parseConstruction("breadboard")).toEqual({ kind: "breadboard", revision: "" });
    expect(parseConstruction("pcb:rev B")).toEqual({ kind: "pcb", revision: "rev B" });
    expect(parseConstruction(" PCB ")).toEqual({ kind: "pcb", revision: "" });
  });

  it("refuses_unknown_kinds_and_revisions_off_a_pcb", () => {
    expect(parseConstruction("veroboard")).toBeNull();
    expect(parseConstruction("breadboard:rev B")).toBeNull();
    expect(parseConstruction(`pcb:${"x".repeat(41)}`)).toBeNull();
  });
});

describe("constructionName", () => {
  it("names_the_board_revision", () => {
    expect(constructionName({ kind: "pcb", revision: "rev B" })).toBe("PCB rev B");
    expect(constructionName({ kind: "pcb", revision: "" })).toBe("PCB (no revision given)");
    expect(constructionName({ kind: "breadboard", revision: "" })).toBe("Breadboard");
  });
});
