import type { Knex } from "knex";
import * as coreSchema from "../migrations/20261201090000_core_schema";
import * as sessionTraces from "../migrations/20261201110000_session_traces";
import * as revokedAccessTokens from "../migrations/20261201130000_revoked_access_tokens";
import * as trendCoveringIndex from "../migrations/20261202090000_trend_covering_index";
import * as heightWalkingAidCounts from "../migrations/20261202120000_height_walking_aid_counts";
import * as refreshReuseGrace from "../migrations/20261202160000_refresh_reuse_grace";
import * as consentEventsResearchProjects from "../migrations/20261203100000_consent_events_research_projects";
import * as caseloadLinksAuditAppendOnly from "../migrations/20261203110000_caseload_links_audit_append_only";
import * as secondFactor from "../migrations/20261203120000_second_factor";
import * as demoAccounts from "../migrations/20261203130000_demo_accounts";
import * as caseloadFlags from "../migrations/20261203150000_caseload_flags";

/**
 * Migrations are listed here with static imports rather than discovered on disk, so the same
 * source works under tsx, vitest and a bundler (Node cannot import .ts files by itself).
 * db/__tests__/migration-source.test.ts fails when a file in migrations/ is missing from this list.
 */
export const MIGRATIONS: Record<string, Knex.Migration> = {
  "20261201090000_core_schema": coreSchema,
  "20261201110000_session_traces": sessionTraces,
  "20261201130000_revoked_access_tokens": revokedAccessTokens,
  "20261202090000_trend_covering_index": trendCoveringIndex,
  "20261202120000_height_walking_aid_counts": heightWalkingAidCounts,
  "20261202160000_refresh_reuse_grace": refreshReuseGrace,
  "20261203100000_consent_events_research_projects": consentEventsResearchProjects,
  "20261203110000_caseload_links_audit_append_only": caseloadLinksAuditAppendOnly,
  "20261203120000_second_factor": secondFactor,
  "20261203130000_demo_accounts": demoAccounts,
  "20261203150000_caseload_flags": caseloadFlags,
};

export const migrationSource: Knex.MigrationSource<string> = {
  getMigrations: async () => Object.keys(MIGRATIONS).sort(),
  getMigrationName: (name) => name,
  getMigration: async (name) => {
    const migration = MIGRATIONS[name];
    if (!migration) throw new Error(`unknown migration ${name}`);
    return migration;
  },
};
