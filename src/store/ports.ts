import type {
  ApiKeyRecord,
  AuditEntry,
  AuditEvent,
  BuildingData,
  BuildingListQuery,
  BuildingRecord,
  BuildingVersion,
  IdempotencyRecord,
  IntervalAnalysisListEntry,
  IntervalAnalysisRecord,
  NewIntervalAnalysis,
  NewRevision,
  Organisation,
  RevisionListEntry,
  RevisionRecord,
  SurveyHead,
  SurveyPageQuery,
  SurveyRange,
  SurveyResultRow,
} from "./types.js";

export type {
  ApiKeyRecord,
  AuditEvent,
  BuildingListQuery,
  IdempotencyRecord,
  NewIntervalAnalysis,
  Organisation,
  SurveyPageQuery,
  SurveyRange,
  SurveyResultRow,
};

/** The first organisation (created by the first migration); the bootstrap admin key belongs to it. */
export const DEFAULT_ORG_ID = "org_default";

/** A key's last-used time is written at most once a minute, to spare writes. */
export const LAST_USED_EVERY_MS = 60_000;

/**
 * The store as the rest of the service sees it: async repositories and `transaction(fn)`. Two implementations,
 * SQLite (better-sqlite3) and PostgreSQL (pg); nothing outside src/store imports a driver. Every method that reads
 * or writes an organisation's data takes its orgId and filters by it.
 */

export interface BuildingsRepository {
  get(orgId: string, id: string): Promise<BuildingRecord | undefined>;
  create(orgId: string, id: string, data: BuildingData, actor: string, at: string): Promise<BuildingRecord>;
  /** Write `data` as the next version; undefined when `expectedVersion` is no longer current. */
  update(orgId: string, id: string, expectedVersion: number, data: BuildingData, actor: string, at: string): Promise<BuildingRecord | undefined>;
  /** By name, then id; keyset pages. */
  list(orgId: string, query: BuildingListQuery): Promise<BuildingRecord[]>;
  /** Every version, oldest first; the last is the current one. */
  history(orgId: string, id: string): Promise<BuildingVersion[]>;
}

export interface SurveysRepository {
  /** A new survey with its first revision. */
  create(orgId: string, buildingId: string, first: NewRevision): Promise<void>;
  /** Append revision n (= latest + 1) and move the head's summary to it; false if n is not next. */
  revise(orgId: string, next: NewRevision): Promise<boolean>;
  head(orgId: string, id: string): Promise<SurveyHead | undefined>;
  revision(orgId: string, id: string, n: number): Promise<RevisionRecord | undefined>;
  revisions(orgId: string, id: string): Promise<RevisionListEntry[]>;
  /** Newest first by surveyed time, then id. */
  listByBuilding(orgId: string, buildingId: string, q: SurveyPageQuery): Promise<SurveyHead[]>;
  /** Oldest first, for trends. */
  trend(orgId: string, buildingId: string, q: SurveyRange & { limit: number }): Promise<SurveyHead[]>;
  /** Latest revision's result and snapshot of each survey that had installed banks, oldest first. */
  withInstalledBanks(orgId: string, buildingId: string, limit: number): Promise<SurveyResultRow[]>;
}

export interface IntervalAnalysesRepository {
  get(orgId: string, id: string): Promise<IntervalAnalysisRecord | undefined>;
  create(orgId: string, a: NewIntervalAnalysis): Promise<IntervalAnalysisRecord>;
  newestOf(orgId: string, buildingId: string): Promise<IntervalAnalysisRecord | undefined>;
  listByBuilding(orgId: string, buildingId: string, q: { beforeSeq?: number; limit: number }): Promise<IntervalAnalysisListEntry[]>;
}

/** A key's record while its first request is still being worked: no response yet. */
export interface IdempotencyClaim {
  requestHash: string;
  createdAt: string;
}

export type ClaimOutcome =
  /** This request owns the key: do the work, then `complete` (in the work's transaction) or `release`. */
  | { kind: "claimed" }
  /** Another request already finished with this key. */
  | { kind: "done"; record: IdempotencyRecord }
  /** Another request holds the key and has not finished (answer 409 with Retry-After). */
  | { kind: "in_flight"; claim: IdempotencyClaim };

export interface IdempotencyRepository {
  /**
   * Claim `key` for a request (committed at once, visible to every instance). A record created before
   * `expiredBeforeIso`, or a claim never completed and older than `staleClaimBeforeIso` (its instance died), is
   * replaced by the new claim.
   */
  claim(orgId: string, key: string, c: IdempotencyClaim, expiredBeforeIso: string, staleClaimBeforeIso: string): Promise<ClaimOutcome>;
  /** Store the response under a claimed key; run inside the transaction that does the work. */
  complete(orgId: string, key: string, r: IdempotencyRecord): Promise<void>;
  /** Give up a claim whose work failed, so a retry can claim it. */
  release(orgId: string, key: string, requestHash: string): Promise<void>;
  /** Delete records created before `cutoffIso`, across organisations; returns how many. */
  purgeBefore(cutoffIso: string): Promise<number>;
}

export interface AuditRepository {
  record(e: AuditEvent): Promise<void>;
  /** Newest first; `beforeId` continues after the last entry of the previous page. */
  list(orgId: string, q: { beforeId?: number; limit: number }): Promise<AuditEntry[]>;
}

export interface KeysRepository {
  findByPrefix(prefix: string): Promise<ApiKeyRecord | undefined>;
  get(orgId: string, id: string): Promise<ApiKeyRecord | undefined>;
  list(orgId: string): Promise<ApiKeyRecord[]>;
  create(k: Omit<ApiKeyRecord, "revokedAt" | "lastUsedAt">): Promise<void>;
  /** True when the key was active and is now revoked. */
  revoke(orgId: string, id: string, at: string): Promise<boolean>;
  /** Record use unless it was recorded less than LAST_USED_EVERY_MS ago. */
  touch(k: ApiKeyRecord, now: Date): Promise<void>;
  /** Keys across all organisations. */
  count(): Promise<number>;
  activeAdminCount(orgId: string): Promise<number>;
  organisationByName(name: string): Promise<Organisation | undefined>;
  organisation(id: string): Promise<Organisation | undefined>;
  createOrganisation(id: string, name: string, at: string): Promise<Organisation>;
}

/** The repositories, bound either to the store (each call its own statement) or to one open transaction. */
export interface Repositories {
  readonly buildings: BuildingsRepository;
  readonly surveys: SurveysRepository;
  readonly intervalAnalyses: IntervalAnalysesRepository;
  readonly idempotency: IdempotencyRepository;
  readonly audit: AuditRepository;
  readonly keys: KeysRepository;
  /** True when the database has never held a building nor an audit entry (the demo seed's condition). */
  isPristine(): Promise<boolean>;
}

export interface Readiness {
  databaseReachable: boolean;
  /** The schema is at the newest migration this build knows. */
  migrationsCurrent: boolean;
  detail?: string;
}

export interface Store extends Repositories {
  readonly kind: "sqlite" | "postgres";
  /** The file path, or the URL without its password: for logs and /ready. */
  readonly location: string;
  /** The clock for every timestamp written; tests move it. */
  now(): Date;
  /**
   * Run `fn` in one transaction: everything it writes through `tx` commits together or not at all. The promise
   * settles only after the commit is durable. `fn` should only read and write: the engine runs before.
   */
  transaction<T>(fn: (tx: Repositories) => Promise<T>): Promise<T>;
  /**
   * Run `fn` in a transaction that holds the store's start-up lock, so several instances starting at once
   * run it one after another (bootstrap key, demo seed). PostgreSQL: an advisory lock; SQLite: an IMMEDIATE transaction.
   */
  exclusively<T>(fn: (tx: Repositories) => Promise<T>): Promise<T>;
  readiness(): Promise<Readiness>;
  close(): Promise<void>;
}
