import type { Knex } from "knex";
import { db } from "../index";

// Following is derived, not copied: the person who created a build and the person who built it follow it without
// a row (so builds made by any path, the demo seed included, need no extra insert). A build row decides when it
// exists — following = false is an unfollow that outlasts the default and mutes a followed project for that build.

/** Why someone follows a build: a build row, a project row, or being its creator or builder. */
export type FollowVia = "build" | "project" | "maker";

export interface FollowStatus {
  /** Whether the person follows the build now. */
  following: boolean;
  /** The reason it holds (null when not following). */
  via: FollowVia | null;
  /** Whether the person follows the build's project (a build unfollow can mute it for this build). */
  followsProject: boolean;
  /** Whether the person created or built the build (they follow by default). */
  isMaker: boolean;
}

export interface Follower {
  userId: string;
  name: string;
  email: string;
  via: FollowVia;
}

/** Someone an alert e-mail goes to. */
export interface AlertRecipient {
  userId: string;
  name: string;
  email: string;
  /** "all" means the person asked for every build's flags; otherwise they follow this build. */
  reason: FollowVia | "all";
}

/**
 * Per active person: their build row, their project follow and whether they made the build, for one build.
 * One row per active user; the callers filter.
 */
function followFacts(buildId: string, trx: Knex | Knex.Transaction) {
  return trx
    .with("b", (q) =>
      q.from("builds as b").join("designs as d", "d.id", "b.design_id").where("b.id", buildId).select("b.id", "b.created_by", "b.built_by", "d.project_id"),
    )
    .from("auth_user as u")
    .joinRaw("cross join b")
    .leftJoin("notification_preferences as np", "np.user_id", "u.id")
    .leftJoin("follows as bf", function () {
      this.on("bf.user_id", "u.id").andOn("bf.build_id", "b.id");
    })
    .leftJoin("follows as pf", function () {
      this.on("pf.user_id", "u.id").andOn("pf.project_id", "b.project_id").andOn("pf.following", trx.raw("true"));
    })
    .where("u.status", "active")
    .select(
      "u.id as user_id",
      "u.name",
      "u.email",
      trx.raw("coalesce(np.flag_emails, 'my-builds') as flag_emails"),
      "bf.following as build_following",
      trx.raw("(pf.user_id is not null) as project_following"),
      trx.raw("(u.id = b.created_by or u.id = b.built_by) as is_maker"),
    );
}

interface FactRow {
  user_id: string;
  name: string;
  email: string;
  flag_emails: "none" | "my-builds" | "all";
  build_following: boolean | null;
  project_following: boolean;
  is_maker: boolean;
}

function via(row: Pick<FactRow, "build_following" | "project_following" | "is_maker">): FollowVia | null {
  if (row.build_following === false) return null;
  if (row.build_following === true) return "build";
  if (row.project_following) return "project";
  if (row.is_maker) return "maker";
  return null;
}

/**
 * Whether one person follows a build, and why.
 * @returns the status; `following` false for an unknown build or a disabled person
 */
export async function getFollowStatus(userId: string, buildId: string, trx: Knex | Knex.Transaction = db()): Promise<FollowStatus> {
  const row = await followFacts(buildId, trx).where("u.id", userId).first<FactRow | undefined>();
  if (!row) return { following: false, via: null, followsProject: false, isMaker: false };
  const reason = via(row);
  return { following: reason !== null, via: reason, followsProject: row.project_following, isMaker: row.is_maker };
}

/** Everyone (active) who follows a build, by name. Notification preferences are not applied here. */
export async function listBuildFollowers(buildId: string, trx: Knex | Knex.Transaction = db()): Promise<Follower[]> {
  const rows: FactRow[] = await followFacts(buildId, trx)
    .where((q) => q.where("bf.following", true).orWhere((w) => w.whereNull("bf.following").where((x) => x.whereNotNull("pf.user_id").orWhereRaw("u.id in (b.created_by, b.built_by)"))))
    .orderBy("u.name");
  return rows.map((r) => ({ userId: r.user_id, name: r.name, email: r.email, via: via(r)! }));
}

/**
 * Who is e-mailed when the build raises a flag: its followers whose preference is "my-builds" (the default), and
 * everyone whose preference is "all", minus anyone who unfollowed this build or chose "none"; active people only.
 */
export async function listAlertRecipients(buildId: string, trx: Knex | Knex.Transaction = db()): Promise<AlertRecipient[]> {
  const rows: FactRow[] = await followFacts(buildId, trx)
    .whereRaw("coalesce(np.flag_emails, 'my-builds') <> 'none'")
    .whereRaw("coalesce(bf.following, true)")
    .where((q) =>
      q
        .whereRaw("np.flag_emails = 'all'")
        .orWhere("bf.following", true)
        .orWhereNotNull("pf.user_id")
        .orWhereRaw("u.id in (b.created_by, b.built_by)"),
    )
    .orderBy("u.email");
  return rows.map((r) => ({ userId: r.user_id, name: r.name, email: r.email, reason: via(r) ?? "all" }));
}

/**
 * Records that a person follows (or stopped following) a build. An unfollow is kept as a row so that the
 * creator's default and a project follow do not bring the build back.
 */
export async function setBuildFollow(userId: string, buildId: string, following: boolean, trx: Knex | Knex.Transaction = db()): Promise<void> {
  // The conflict target names the partial unique index's predicate, which Knex's onConflict cannot express.
  await trx.raw(
    `insert into follows (user_id, build_id, following) values (?, ?, ?)
     on conflict (user_id, build_id) where build_id is not null do update set following = excluded.following, updated_at = now()`,
    [userId, buildId, following],
  );
}

/** Starts following a project (every build of it, except builds the person unfollowed one by one). */
export async function followProject(userId: string, projectId: string, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx.raw(
    `insert into follows (user_id, project_id, following) values (?, ?, true)
     on conflict (user_id, project_id) where project_id is not null do update set following = true, updated_at = now()`,
    [userId, projectId],
  );
}

/** Stops following a project; build follows and the maker's default are not touched. */
export async function unfollowProject(userId: string, projectId: string, trx: Knex | Knex.Transaction = db()): Promise<boolean> {
  return (await trx("follows").where({ user_id: userId, project_id: projectId }).delete()) > 0;
}

/** Whether the person follows the project. */
export async function isFollowingProject(userId: string, projectId: string, trx: Knex | Knex.Transaction = db()): Promise<boolean> {
  const row = await trx("follows").where({ user_id: userId, project_id: projectId, following: true }).first("id");
  return row !== undefined;
}
