import type { Knex } from "knex";
import type { Topology } from "@/lib/oscillator/design";
import { MIN_ALLOWANCE_F, RELATIVE_ALLOWANCE, SIGMA_ALLOWANCE } from "@/lib/drift-trend/implied-capacitance";
import { db } from "../index";
import type { BuildKind } from "./builds";

/** One build whose implied extra capacitance holds across its tweaks, as the lab's figure rests on it. */
export interface SteadyLayoutBuild {
  buildId: string;
  label: string;
  designId: string;
  designName: string;
  projectId: string;
  projectName: string;
  /** Mean of the build's segment means, F (signed), over its trusted runs. */
  typicalF: number;
  /** Largest minus smallest segment mean, F. */
  spreadF: number;
  /** Trusted analysed runs behind the value. */
  runCount: number;
  /** Stretches between applied tweaks that hold a run. */
  segmentCount: number;
  /**
   * Mean fractional error of L_eff that alone would explain the runs, (f_pred/f_meas)² − 1; negative when the build
   * runs above its prediction. Null when no run has both frequencies.
   */
  inductanceErrorFraction: number | null;
}

/** The builds of one construction kind (PCBs per revision) and topology. */
export interface LayoutGroupRows {
  kind: BuildKind;
  /** The PCB revision as first written ("rev B"); "" for the other kinds. */
  kindRevision: string;
  topology: Topology;
  /** Builds with at least one trusted analysed run, steady or not. */
  candidateBuildCount: number;
  /** Builds whose trend is steady, ordered by their typical value. */
  steadyBuilds: SteadyLayoutBuild[];
}

export interface LayoutFilter {
  kind?: BuildKind;
  topology?: Topology;
}

interface GroupRow {
  kind: BuildKind;
  kind_revision: string;
  topology: Topology;
  candidate_build_count: number;
  steady_builds: SteadyLayoutBuild[] | null;
}

/*
 * One statement for the whole lab, however many builds: the trusted runs (analysed, with an implied capacitance,
 * no trust warning), their segments between applied tweaks (a tweak belongs before the first run at or after it,
 * as the build page's timeline places it), each build's segment means, pooled repeatability and steadiness by the
 * rule of lib/drift-trend's classifyImpliedCapacitanceTrend, then the steady builds per kind × topology.
 */
const AGGREGATE_SQL = `
with trusted as (
  select r.id, r.build_id, r.created_at,
         r.implied_extra_capacitance_f as c_f,
         case when (r.snapshot->>'cEffF')::double precision > 0 and r.measured_hz > 0 and r.frequency_uncertainty_hz >= 0
              then 2 * abs((r.snapshot->>'cEffF')::double precision + r.implied_extra_capacitance_f) * r.frequency_uncertainty_hz / r.measured_hz
         end as u_f,
         case when r.measured_hz > 0 and coalesce((r.snapshot->>'predictedHz')::double precision, r.predicted_hz) > 0
              then power(coalesce((r.snapshot->>'predictedHz')::double precision, r.predicted_hz) / r.measured_hz, 2) - 1
         end as l_error,
         lag(r.created_at) over (partition by r.build_id order by r.created_at, r.id) as previous_at
  from runs r
  join builds b on b.id = r.build_id
  join designs d on d.id = b.design_id
  where r.status = 'done'
    and r.withdrawn_at is null
    and r.implied_extra_capacitance_f is not null
    and coalesce(jsonb_array_length(case when jsonb_typeof(r.results->'warnings') = 'array' then r.results->'warnings' end), 0) = 0
    and (?::text is null or b.kind = ?::text)
    and (?::text is null or d.topology = ?::text)
),
segmented as (
  select t.*,
         sum(case when t.previous_at is not null and exists (
               select 1 from tweaks w
               where w.build_id = t.build_id and not w.planned and w.created_at > t.previous_at and w.created_at <= t.created_at
             ) then 1 else 0 end)
           over (partition by t.build_id order by t.created_at, t.id) as segment
  from trusted t
),
segments as (
  select build_id, segment, count(*) as n, avg(c_f) as mean_f, coalesce(var_samp(c_f), 0) * (count(*) - 1) as squares
  from segmented group by build_id, segment
),
per_build as (
  select s.build_id,
         count(*)::int as segment_count,
         sum(s.n)::int as run_count,
         avg(s.mean_f) as typical_f,
         max(s.mean_f) - min(s.mean_f) as spread_f,
         sqrt(sum(s.squares) / nullif(sum(s.n - 1), 0)) as repeatability_f
  from segments s group by s.build_id
),
judged as (
  select p.*, m.measurement_f, m.l_error,
         greatest(?::double precision, ? * abs(p.typical_f), ? * sqrt(2) * greatest(coalesce(p.repeatability_f, 0), coalesce(m.measurement_f, 0))) as allowance_f
  from per_build p
  join (select build_id, avg(u_f) as measurement_f, avg(l_error) as l_error from trusted group by build_id) m on m.build_id = p.build_id
)
select b.kind,
       case when b.kind = 'pcb' then min(trim(b.kind_revision)) else '' end as kind_revision,
       d.topology,
       count(*)::int as candidate_build_count,
       jsonb_agg(jsonb_build_object(
         'buildId', b.id, 'label', b.label, 'designId', d.id, 'designName', d.name, 'projectId', p.id, 'projectName', p.name,
         'typicalF', j.typical_f, 'spreadF', j.spread_f, 'runCount', j.run_count, 'segmentCount', j.segment_count,
         'inductanceErrorFraction', j.l_error
       ) order by j.typical_f, b.id) filter (where j.run_count >= 2 and j.segment_count >= 2 and j.spread_f <= j.allowance_f) as steady_builds
from judged j
join builds b on b.id = j.build_id
join designs d on d.id = b.design_id
join projects p on p.id = d.project_id
group by b.kind, case when b.kind = 'pcb' then lower(trim(b.kind_revision)) else '' end, d.topology
order by b.kind, kind_revision, d.topology
`;

/**
 * What the lab's builds imply beyond their models, per construction kind (PCBs per revision) and topology: the
 * builds whose implied extra capacitance is steady across tweaks, over trusted runs only. One query, no loop per
 * build; the robust statistics over the builds are computed in lib/layouts.
 */
export async function listLayoutGroups(filter: LayoutFilter = {}, trx: Knex | Knex.Transaction = db()): Promise<LayoutGroupRows[]> {
  const kind = filter.kind ?? null;
  const topology = filter.topology ?? null;
  const result = await trx.raw<{ rows: GroupRow[] }>(AGGREGATE_SQL, [
    kind,
    kind,
    topology,
    topology,
    MIN_ALLOWANCE_F,
    RELATIVE_ALLOWANCE,
    SIGMA_ALLOWANCE,
  ]);
  return result.rows.map((r) => ({
    kind: r.kind,
    kindRevision: r.kind_revision,
    topology: r.topology,
    candidateBuildCount: r.candidate_build_count,
    steadyBuilds: r.steady_builds ?? [],
  }));
}

/** A build as the comparison heads it. */
export interface CompareBuildRow {
  id: string;
  label: string;
  kind: BuildKind;
  kindRevision: string;
  status: string;
  designId: string;
  designName: string;
  topology: Topology;
  projectId: string;
  projectName: string;
}

/** An analysed run of a compared build, light: what the implied-capacitance trend and the run picker need. */
export interface CompareTrendRun {
  id: string;
  buildId: string;
  createdAt: Date;
  originalFilename: string;
  /** Withdrawn runs are offered for choosing but never enter the trend. */
  withdrawn: boolean;
  impliedExtraCapacitanceF: number | null;
  cEffF: number | null;
  measuredHz: number | null;
  frequencyUncertaintyHz: number | null;
}

export interface CompareTweak {
  id: string;
  buildId: string;
  createdAt: Date;
  partRef: string | null;
  planned: boolean;
}

/** The compared run of a build (the chosen one, else the newest that is not withdrawn), with what the comparison shows of it. */
export interface CompareLatestRun {
  id: string;
  buildId: string;
  createdAt: Date;
  originalFilename: string;
  /** When the chosen run is withdrawn (a default run never is). */
  withdrawnAt: Date | null;
  measuredHz: number | null;
  frequencyUncertaintyHz: number | null;
  predictedHz: number | null;
  worstCase: { minHz: number; maxHz: number } | null;
  statistical: { minHz: number; maxHz: number } | null;
  driftPpm: number | null;
  impliedExtraCapacitanceF: number | null;
  thdPercent: number | null;
  worstHarmonicDbc: number | null;
  verdict: "pass" | "fail" | null;
  /** Measured harmonic levels, by order; orders without a level are left out. */
  harmonics: { order: number; dBc: number }[];
  /** Codes of the trust warnings the analysis raised. */
  warningCodes: string[];
  /** The analysis's stability figures as stored (results.stability), or null when the engine did not measure them. */
  stability: unknown;
}

export interface CompareRows {
  builds: CompareBuildRow[];
  trendRuns: CompareTrendRun[];
  tweaks: CompareTweak[];
  latestRuns: CompareLatestRun[];
}

/**
 * Everything a comparison of builds reads, in four statements whatever the number of builds: the builds, their
 * analysed runs (light, withdrawn ones flagged), their tweaks, and each build's compared run in full: the one
 * chosen for it, else its newest analysed run that is not withdrawn.
 * @param buildIds - UUIDs; unknown ones are simply absent from the answer.
 * @param chosenRunIds - UUIDs of runs to compare instead of the default; the caller checks they belong to the builds.
 */
export async function listCompareRows(
  buildIds: readonly string[],
  chosenRunIds: readonly string[] = [],
  trx: Knex | Knex.Transaction = db(),
): Promise<CompareRows> {
  const ids = [...buildIds];
  const chosen = [...chosenRunIds];
  const [builds, trendRuns, tweaks, latest] = await Promise.all([
    trx("builds as b")
      .join("designs as d", "d.id", "b.design_id")
      .join("projects as p", "p.id", "d.project_id")
      .whereIn("b.id", ids)
      .select(
        "b.id",
        "b.label",
        "b.kind",
        "b.kind_revision as kindRevision",
        "b.status",
        "d.id as designId",
        "d.name as designName",
        "d.topology",
        "p.id as projectId",
        "p.name as projectName",
      ) as Promise<CompareBuildRow[]>,
    trx("runs as r")
      .whereIn("r.build_id", ids)
      .where("r.status", "done")
      .orderBy([{ column: "r.created_at" }, { column: "r.id" }])
      .select(
        "r.id",
        "r.build_id as buildId",
        "r.created_at as createdAt",
        "r.original_filename as originalFilename",
        trx.raw(`r.withdrawn_at is not null as "withdrawn"`),
        "r.implied_extra_capacitance_f as impliedExtraCapacitanceF",
        trx.raw(`(r.snapshot->>'cEffF')::double precision as "cEffF"`),
        "r.measured_hz as measuredHz",
        "r.frequency_uncertainty_hz as frequencyUncertaintyHz",
      ) as Promise<CompareTrendRun[]>,
    trx("tweaks as t")
      .whereIn("t.build_id", ids)
      .orderBy([{ column: "t.created_at" }, { column: "t.id" }])
      .select("t.id", "t.build_id as buildId", "t.created_at as createdAt", "t.part_ref as partRef", "t.planned") as Promise<CompareTweak[]>,
    trx.raw<{ rows: CompareLatestRun[] }>(
      `select distinct on (r.build_id)
              r.id, r.build_id as "buildId", r.created_at as "createdAt", r.original_filename as "originalFilename",
              r.withdrawn_at as "withdrawnAt",
              case when jsonb_typeof(r.results->'stability') = 'object' then r.results->'stability' end as stability,
              r.measured_hz as "measuredHz", r.frequency_uncertainty_hz as "frequencyUncertaintyHz",
              coalesce((r.snapshot->>'predictedHz')::double precision, r.predicted_hz) as "predictedHz",
              case when jsonb_typeof(r.snapshot->'worstCase') = 'object' then r.snapshot->'worstCase' end as "worstCase",
              case when jsonb_typeof(r.snapshot->'statistical') = 'object' then r.snapshot->'statistical' end as "statistical",
              r.drift_ppm as "driftPpm", r.implied_extra_capacitance_f as "impliedExtraCapacitanceF",
              r.thd_percent as "thdPercent", r.worst_harmonic_dbc as "worstHarmonicDbc", r.verdict,
              coalesce((select jsonb_agg(jsonb_build_object('order', (h->>'order')::int, 'dBc', (h->>'dBc')::double precision) order by (h->>'order')::int)
                          from jsonb_array_elements(case when jsonb_typeof(r.results->'harmonics') = 'array' then r.results->'harmonics' else '[]'::jsonb end) h
                         where jsonb_typeof(h->'dBc') = 'number' and jsonb_typeof(h->'order') = 'number'), '[]'::jsonb) as harmonics,
              coalesce((select jsonb_agg(w->>'code')
                          from jsonb_array_elements(case when jsonb_typeof(r.results->'warnings') = 'array' then r.results->'warnings' else '[]'::jsonb end) w), '[]'::jsonb) as "warningCodes"
         from runs r
        where r.build_id = any(?::uuid[]) and r.status = 'done' and (r.withdrawn_at is null or r.id = any(?::uuid[]))
        order by r.build_id, (r.id = any(?::uuid[])) desc, r.created_at desc, r.id desc`,
      [ids, chosen, chosen],
    ),
  ]);
  return { builds, trendRuns, tweaks, latestRuns: latest.rows };
}
