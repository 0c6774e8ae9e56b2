import { describe, expect, it } from "vitest";
import { firstDirection, otherParams, parseTableQuery, sortHref, tableHref, tableParams } from "@/components/builds-table/table-query";

describe("parseTableQuery", () => {
  it("reads_every_key_of_the_schema", () => {
    const { query, error } = parseTableQuery({ q: "BB", state: "flagged,in-spec", kind: "pcb", sort: "thdPercent", dir: "asc", page: "3", pageSize: "50" });
    expect(error).toBeNull();
    expect(query).toMatchObject({ q: "BB", state: ["flagged", "in-spec"], kind: "pcb", sort: "thdPercent", dir: "asc", page: 3, pageSize: 50 });
  });

  it("repeated_state_keys_from_a_checkbox_form_are_a_list", () => {
    expect(parseTableQuery({ state: ["flagged", "accepted"] }).query.state).toEqual(["flagged", "accepted"]);
  });

  it("a_prefix_reads_only_the_tables_keys", () => {
    const { query } = parseTableQuery({ q: "designs search", b_q: "PCB", b_page: "2" }, "b_");
    expect(query.q).toBe("PCB");
    expect(query.page).toBe(2);
  });

  it("a_bad_key_is_dropped_with_its_message_and_the_rest_applies", () => {
    const { query, error } = parseTableQuery({ sort: "colour", q: "BB" });
    expect(query.sort).toBeUndefined();
    expect(query.q).toBe("BB");
    expect(error).toMatch(/Sort by one of/);
  });
});

describe("tableParams", () => {
  it("defaults_are_left_out_and_states_are_joined", () => {
    expect(tableParams({ state: ["flagged", "in-spec"], page: 1 }, "b_")).toEqual({ b_state: "flagged,in-spec" });
  });
});

describe("tableHref", () => {
  it("a_filter_change_goes_back_to_page_one_and_keeps_other_params", () => {
    const href = tableHref("/projects/p", { topology: "colpitts" }, { page: 4, sort: "label" }, { q: "BB" });
    const url = new URL(href, "http://x");
    expect(url.pathname).toBe("/projects/p");
    expect(Object.fromEntries(url.searchParams)).toEqual({ topology: "colpitts", sort: "label", q: "BB" });
  });
  it("a_page_change_keeps_the_filters", () => {
    const url = new URL(tableHref("/d", {}, { state: ["flagged"] }, { page: 2 }), "http://x");
    expect(Object.fromEntries(url.searchParams)).toEqual({ state: "flagged", page: "2" });
  });
  it("no_params_is_the_bare_path", () => {
    expect(tableHref("/d", {}, {}, {})).toBe("/d");
  });
});

describe("sortHref", () => {
  it("a_new_column_sorts_in_its_first_direction", () => {
    expect(new URL(sortHref("/d", {}, {}, "label"), "http://x").searchParams.get("dir")).toBe("asc");
    expect(new URL(sortHref("/d", {}, {}, "thdPercent"), "http://x").searchParams.get("dir")).toBe("desc");
  });
  it("the_active_column_flips_its_direction", () => {
    expect(new URL(sortHref("/d", {}, { sort: "thdPercent", dir: "desc" }, "thdPercent"), "http://x").searchParams.get("dir")).toBe("asc");
    expect(new URL(sortHref("/d", {}, { sort: "label" }, "label"), "http://x").searchParams.get("dir")).toBe("desc");
  });
});

describe("firstDirection", () => {
  it("names_ascending_numbers_descending", () => {
    expect(firstDirection("state")).toBe("asc");
    expect(firstDirection("created")).toBe("desc");
  });
});

describe("otherParams", () => {
  it("leaves_out_the_tables_keys_and_empty_values", () => {
    expect(otherParams({ q: "x", b_q: "y", b_state: ["a"], topology: "", cursor: ["c1", "c2"] }, "b_")).toEqual({ q: "x", cursor: "c1" });
  });
});
