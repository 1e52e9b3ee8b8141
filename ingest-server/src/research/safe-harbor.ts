import { createHmac } from "node:crypto";

/**
 * De-identification rules for research exports, applied under HIPAA Safe Harbor
 * (45 CFR 164.514(b)(2)): the 18 identifier classes are removed or generalised before a row leaves
 * the server. Each function names the paragraph it serves.
 */

/**
 * Smallest number of distinct subjects a published cell may describe: k-anonymity (Sweeney 2002,
 * Int J Uncertain Fuzziness Knowl-Based Syst 10:557). The model leaves k to the publisher; k = 5 is
 * common practice for small-cell suppression, not a value from that paper.
 */
export const MIN_CELL_SUBJECTS = 5;

const SEP = "\u0000";

/**
 * A research project's own pseudonym key, derived from the server's research secret and the
 * project's random 32-byte salt (HMAC-SHA256, RFC 2104). The salt is stored with the project, the
 * secret only in the server's environment, so a database copy alone cannot recompute any key.
 */
export function projectKey(serverSecret: string, salt: Buffer): Buffer {
  if (serverSecret.length < 16) throw new RangeError("research HMAC key must be at least 16 characters");
  if (salt.length !== 32) throw new RangeError("a project key salt is 32 bytes");
  return createHmac("sha256", serverSecret).update("pendula-research-project-key").update(salt).digest();
}

/**
 * 164.514(b)(2)(i)(R) and (c): a re-identification code must not be derived from an identifier in a
 * way that can be reversed. The subject id is HMAC-SHA256(project key, project id ‖ 0x00 ‖ patient
 * id): it cannot be inverted without the key, stays the same for one patient in every export of one
 * project, and two projects (two keys, two project ids) give ids that cannot be joined.
 */
export function pseudonymousSubjectId(key: Buffer, projectId: string, patientId: string): string {
  return `sub-${createHmac("sha256", key).update(`${projectId}${SEP}${patientId}`, "utf8").digest("hex").slice(0, 24)}`;
}

/** A session's reference in one project's exports: keyed like the subject id, so it cannot be joined across projects either. */
export function pseudonymousSessionRef(key: Buffer, projectId: string, sessionId: string): string {
  return `ses-${createHmac("sha256", key).update(`session${SEP}${projectId}${SEP}${sessionId}`, "utf8").digest("hex").slice(0, 32)}`;
}

/**
 * 164.514(b)(2)(i)(C): ages over 89 are aggregated into one "90+" category; below that we publish
 * 5-year bands ("60-64") rather than exact ages. Age is computed from years only, because the
 * birth year is the only date element Safe Harbor lets us keep.
 */
export function ageBand(ageYears: number): string {
  if (!Number.isFinite(ageYears) || ageYears < 0) throw new RangeError(`age must be a non-negative number, got ${ageYears}`);
  if (ageYears >= 90) return "90+";
  const low = Math.floor(ageYears / 5) * 5;
  return `${low}-${low + 4}`;
}

export const AGE_BANDS: readonly string[] = [
  ...Array.from({ length: 18 }, (_, i) => `${i * 5}-${i * 5 + 4}`),
  "90+",
];

/**
 * Age at enrolment in whole years from the birth year and the enrolment year. Using enrolment keeps a
 * subject in one age band for the whole study, so suppression decisions do not change week by week.
 */
export function ageAtEnrolment(birthYear: number, enrolledOn: Date): number {
  return enrolledOn.getUTCFullYear() - birthYear;
}

const MS_PER_WEEK = 7 * 24 * 3600 * 1000;

/**
 * 164.514(b)(2)(i)(C): all date elements except the year are removed. Sessions are placed on a study
 * clock (whole weeks since enrolment, week 0 = the first seven days) instead of a calendar date.
 */
export function weeksSinceEnrolment(recordedAt: Date, enrolledOn: Date): number {
  return Math.floor((recordedAt.getTime() - enrolledOn.getTime()) / MS_PER_WEEK);
}

/**
 * The study clock as exported. Exact weeks plus the day of an export would give away the enrolment
 * day (an active subject's highest week ≈ export date − enrolment date), so:
 * - weeks are published as 4-week blocks, named by their first week (0, 4, 8, …);
 * - every week from 52 on is published as 52 ("52 or more"), so long-term subjects carry no date;
 * - sessions recorded in the 28 days before the export are held back (RELEASE_LAG_DAYS), so the last
 *   visible block never touches the export day.
 * Together the enrolment day can be narrowed to a window of at least eight weeks, never to a day or
 * a week. Block width, cap and lag are common practice (our choice), not values from a source.
 */
export const STUDY_WEEK_BLOCK = 4;
export const STUDY_WEEK_CAP = 52;
export const RELEASE_LAG_DAYS = 28;

export function studyWeekBlock(weeks: number): number {
  if (!Number.isInteger(weeks) || weeks < 0) throw new RangeError(`weeks since enrolment must be a whole number ≥ 0, got ${weeks}`);
  return Math.min(STUDY_WEEK_CAP, Math.floor(weeks / STUDY_WEEK_BLOCK) * STUDY_WEEK_BLOCK);
}

/** Sessions recorded at or after this instant are held back from an export made at `now`. */
export function releaseCutoff(now: Date): Date {
  return new Date(now.getTime() - RELEASE_LAG_DAYS * 24 * 3600 * 1000);
}

/**
 * Cell suppression: a group of fewer than MIN_CELL_SUBJECTS distinct subjects is withheld, because
 * a rare combination of quasi-identifiers (condition × age band) can single a person out even after
 * the direct identifiers of 164.514(b)(2)(i) are gone.
 */
export function suppressSmallCells<T>(
  rows: readonly T[],
  cellOf: (row: T) => string,
  subjectOf: (row: T) => string,
  k = MIN_CELL_SUBJECTS,
): { kept: T[]; cells: Array<{ cell: string; subjects: number; suppressed: boolean }> } {
  const subjects = new Map<string, Set<string>>();
  for (const row of rows) {
    const cell = cellOf(row);
    let set = subjects.get(cell);
    if (!set) subjects.set(cell, (set = new Set()));
    set.add(subjectOf(row));
  }
  const cells = [...subjects.entries()]
    .map(([cell, set]) => ({ cell, subjects: set.size, suppressed: set.size < k }))
    .sort((a, b) => a.cell.localeCompare(b.cell));
  const suppressed = new Set(cells.filter((c) => c.suppressed).map((c) => c.cell));
  return { kept: rows.filter((row) => !suppressed.has(cellOf(row))), cells };
}
