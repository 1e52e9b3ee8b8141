import type { z } from "zod";
import {
  assignmentView,
  deviceView,
  meResponse,
  patientDetail,
  patientIdentity,
  patientSessions,
  patientSummary,
  sessionDetail,
  sessionSummary,
  tokenResponse,
  trendsResponse,
  type AssignmentView,
  type CoordinationEvent,
  type DeviceView,
  type MeResponse,
  type PatientDetail,
  type PatientIdentity,
  type PatientSummary,
  type Role,
  type SessionDetail,
  type SessionSummary,
  type TokenResponse,
  type TrendBand,
  type TrendMetric,
  type TrendPoint,
  type TrendsResponse,
} from "@pendula/ingest-server/contracts";

// Server answers for component tests, built complete and checked against the server's own contract
// (the portal parses answers with the same strict schemas), so a fixture cannot drift from what
// the server sends. Names and places are invented.

/** Parses the fixture with the contract: a missing or unknown field fails the test that builds it. */
export function conforming<S extends z.ZodType>(schema: S, value: z.input<S>): z.output<S> {
  return schema.parse(value);
}

/** A UUID whose last group is `n` (readable in failures, valid for the contracts). */
export const testUuid = (n: number, prefix = "00000000"): string => `${prefix}-0000-4000-8000-${String(n).padStart(12, "0")}`;

export function meFixture(over: Partial<MeResponse> & { role: Role }): MeResponse {
  return conforming(meResponse, {
    id: testUuid(1, "0000aaaa"),
    email: `${over.role}@ferngate-clinic.test`,
    displayName: `Test ${over.role}`,
    scopes: [],
    ...over,
  });
}

/** The sign-in answer for the person `me` describes. */
export function tokenFixture(me: MeResponse, over: Partial<Omit<TokenResponse, "user">> = {}): TokenResponse {
  return conforming(tokenResponse, {
    accessToken: `token-${me.role}`,
    tokenType: "Bearer",
    expiresIn: 900,
    user: { id: me.id, role: me.role, displayName: me.displayName, ...(me.patientId ? { patientId: me.patientId } : {}) },
    secondFactor: "verified",
    ...over,
  });
}

export function assignmentFixture(over: Partial<AssignmentView> = {}): AssignmentView {
  return conforming(assignmentView, {
    id: testUuid(1, "a0000000"),
    deviceId: testUuid(1, "d0000000"),
    patientId: testUuid(1, "7d1c2a3b"),
    patientLabel: "Patient",
    placement: "left_shank",
    from: "2026-09-01T08:00:00.000Z",
    to: null,
    ...over,
  });
}

export function deviceFixture(over: Partial<DeviceView> = {}): DeviceView {
  return conforming(deviceView, {
    id: testUuid(1, "d0000000"),
    serial: "PND-S-0001",
    kind: "imu6",
    status: "in_stock",
    firmware: "2.4.1",
    accRangeG: 16,
    gyroRangeDps: 2000,
    notes: null,
    assignment: null,
    ...over,
  });
}

export function patientIdentityFixture(over: Partial<PatientIdentity> = {}): PatientIdentity {
  return conforming(patientIdentity, {
    id: testUuid(1, "7d1c2a3b"),
    displayName: "Patient",
    researchId: "R-0001",
    enrolledOn: "2026-08-01",
    researchConsent: false,
    ...over,
  });
}

/** `latest` may be given in part; the columns left out are null (no value yet). */
export function patientDetailFixture(over: Partial<PatientDetail> = {}): PatientDetail {
  return conforming(patientDetail, { ...patientIdentityFixture(), ...over });
}

export function patientSummaryFixture(
  over: Omit<Partial<PatientSummary>, "latest"> & { latest?: Partial<PatientSummary["latest"]> } = {},
): PatientSummary {
  const { latest, ...rest } = over;
  return conforming(patientSummary, {
    ...patientIdentityFixture(),
    birthYear: 1958,
    sex: "female",
    condition: "stroke",
    expectedUploadsPerWeek: 1,
    sessionsCount: 0,
    lastUploadAt: null,
    lastRecordedAt: null,
    adherencePct: null,
    flags: [],
    ...rest,
    latest: { sessionId: null, cadenceStepsPerMin: null, strideTimeCvPct: null, phaseCoordinationIndexPct: null, walkingSpeedMPerS: null, ...latest },
  });
}

export function sessionSummaryFixture(over: Partial<SessionSummary> = {}): SessionSummary {
  return conforming(sessionSummary, {
    id: testUuid(1, "5e550000"),
    patientId: testUuid(1, "7d1c2a3b"),
    status: "done",
    progressPct: 100,
    recordedAt: "2026-09-07T09:00:00.000Z",
    uploadedAt: "2026-09-07T09:30:00.000Z",
    durationS: 120,
    algorithmVersion: "test-1",
    ...over,
  });
}

/** One page of GET /api/patients/:id/sessions holding these sessions. */
export function sessionPageFixture(items: Array<Partial<SessionSummary>>) {
  return conforming(patientSessions, { items: items.map((i) => sessionSummaryFixture(i)), total: items.length, limit: 500, offset: 0 });
}

export function sessionDetailFixture(over: Partial<SessionDetail> = {}): SessionDetail {
  return conforming(sessionDetail, { ...sessionSummaryFixture(), files: [], ...over });
}

type PointIn = Pick<TrendPoint, "sessionId" | "recordedAt" | "value"> & Partial<TrendPoint>;
type BandIn = Pick<TrendBand, "low" | "high" | "label"> & Omit<Partial<TrendBand>, "population"> & { population?: Partial<TrendBand["population"]> };
export type MetricIn = Pick<TrendMetric, "key" | "unit"> &
  Omit<Partial<TrendMetric>, "points" | "bands" | "mdc"> & {
    points: PointIn[];
    bands?: BandIn[];
    mdc?: (Pick<NonNullable<TrendMetric["mdc"]>, "value" | "source"> & Partial<NonNullable<TrendMetric["mdc"]>>) | null;
  };
type EventIn = Pick<CoordinationEvent, "kind" | "sessionId" | "recordedAt" | "message"> & Partial<CoordinationEvent>;

/**
 * A trends answer from the fields a test cares about; the rest take the values the server sends
 * when there is nothing to say (no count, no baseline or MDC yet, no band, no event).
 */
export function trendsFixture(over: { patientId: string; metrics: MetricIn[]; events?: EventIn[]; cautions?: string[] }): TrendsResponse {
  return conforming(trendsResponse, {
    patientId: over.patientId,
    metrics: over.metrics.map(({ points, bands = [], mdc = null, ...m }) => ({
      baseline: null,
      slopeFlag: null,
      direction: null,
      bandNote: null,
      importantChange: null,
      ...m,
      mdc: mdc && { citation: "", sem: mdc.value / 2.772, basis: "", ...mdc },
      points: points.map((p) => ({ n: null, walkingAid: null, ...p })),
      bands: bands.map(({ population, ...b }, i) => ({
        id: `band-${i}`,
        citation: "",
        walkingCondition: "",
        measurementSystem: "",
        publishedValue: "",
        derivation: "",
        location: "",
        ...b,
        population: { description: "", role: "healthy-comparison" as const, ageLimitsBasis: "source" as const, ...population },
      })),
    })),
    events: (over.events ?? []).map((e) => ({ metricKey: "", from: 0, to: 0, ...e })),
    cautions: over.cautions ?? [],
  });
}

/** One metric of a trends answer, completed as trendsFixture does. */
export function trendMetricFixture(metric: MetricIn): TrendMetric {
  return trendsFixture({ patientId: testUuid(1, "7d1c2a3b"), metrics: [metric] }).metrics[0]!;
}
