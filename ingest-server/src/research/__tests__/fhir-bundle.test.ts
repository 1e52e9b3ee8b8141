import { describe, expect, it } from "vitest";
import { METRIC_CODE_SYSTEM, observationBundle, SUBJECT_ID_SYSTEM } from "../fhir-bundle";

const row = {
  subjectId: "sub-abc123",
  sessionRef: "ses-0123456789abcdef0123456789abcdef",
  condition: "stroke",
  ageBand: "60-64",
  weeksSinceEnrolment: 6,
  algorithmVersion: "1.0.0",
  metrics: { cadenceStepsPerMin: 104.2, strideTimeCvPct: 2.1, phaseCoordinationIndexPct: null, dfaAlpha: 0.81 },
};

// Shape per the FHIR R4 specification: Bundle (type, entry.fullUrl/resource, bdl-1 forbids total on
// a collection), Observation (status and code required; component.code + value[x]), Quantity
// (system http://unitsofmeasure.org with a UCUM code).
describe("observationBundle(rows)", () => {
  const bundle = observationBundle([row], ["cadenceStepsPerMin", "strideTimeCvPct", "phaseCoordinationIndexPct", "dfaAlpha"]);

  it("is a collection bundle with the code system first and one Observation per session", () => {
    expect(bundle.resourceType).toBe("Bundle");
    expect(bundle.type).toBe("collection");
    expect(bundle).not.toHaveProperty("total");
    expect(bundle.entry.map((e) => e.resource.resourceType)).toEqual(["CodeSystem", "Observation"]);
    expect(bundle.entry[1]?.fullUrl).toMatch(/^urn:uuid:[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-8[0-9a-f]{3}-[0-9a-f]{12}$/);
  });

  it("codes each metric from the local code system with UCUM quantities, leaving nulls out", () => {
    const obs = bundle.entry[1]?.resource as ReturnType<typeof import("../fhir-bundle").sessionObservation>;
    expect(obs.status).toBe("final");
    expect(obs.subject).toEqual({ identifier: { system: SUBJECT_ID_SYSTEM, value: "sub-abc123" } });
    expect(obs.component.map((c) => c.code.coding[0]?.code)).toEqual(["cadenceStepsPerMin", "strideTimeCvPct", "dfaAlpha"]);
    expect(obs.component[0]?.valueQuantity).toEqual({ value: 104.2, unit: "/min", system: "http://unitsofmeasure.org", code: "/min" });
    expect(obs.component[1]?.valueQuantity.code).toBe("%");
    expect(obs.component[2]?.valueQuantity.code).toBe("1");
    expect(obs.component.every((c) => c.code.coding[0]?.system === METRIC_CODE_SYSTEM)).toBe(true);
  });

  it("carries no calendar date and no database id", () => {
    const text = JSON.stringify(bundle);
    expect(text).not.toMatch(/effective|issued|\d{4}-\d{2}-\d{2}/);
    const obs = bundle.entry[1]?.resource as { id: string; extension: Array<{ url: string; valueInteger?: number }> };
    expect(obs.id).toBe(row.sessionRef);
    expect(obs.extension.find((e) => e.url.endsWith("weeks-since-enrolment-block"))?.valueInteger).toBe(6);
  });
});

// UCUM (https://ucum.org/ucum): metre is "m", speed "m/s", plane angle degree "deg" — case-sensitive codes.
describe("observationBundle with the spatial and arm swing metrics", () => {
  const spatial = {
    ...row,
    metrics: { walkingSpeedMPerS: 0.84, strideLengthM: 1.02, armSwingAmplitudeDegLeft: 21.5, armSwingAsymmetryPct: 34 },
  };
  const keys = ["walkingSpeedMPerS", "strideLengthM", "armSwingAmplitudeDegLeft", "armSwingAsymmetryPct"];
  const obs = observationBundle([spatial], keys).entry[1]?.resource as ReturnType<typeof import("../fhir-bundle").sessionObservation>;

  it("gives walking speed in m/s and stride length in m, coded from the local code system", () => {
    const byCode = Object.fromEntries(obs.component.map((c) => [c.code.coding[0]!.code, c]));
    expect(byCode.walkingSpeedMPerS?.valueQuantity).toEqual({ value: 0.84, unit: "m/s", system: "http://unitsofmeasure.org", code: "m/s" });
    expect(byCode.strideLengthM?.valueQuantity).toEqual({ value: 1.02, unit: "m", system: "http://unitsofmeasure.org", code: "m" });
    expect(byCode.walkingSpeedMPerS?.code.coding[0]).toMatchObject({ system: METRIC_CODE_SYSTEM, display: "Walking speed" });
    expect(byCode.armSwingAmplitudeDegLeft?.valueQuantity.code).toBe("deg");
    expect(byCode.armSwingAsymmetryPct?.valueQuantity.code).toBe("%");
  });

  it("lists the new codes in the bundle's code system", () => {
    const cs = observationBundle([spatial], keys).entry[0]?.resource as { concept: Array<{ code: string; display: string }> };
    expect(cs.concept.map((c) => c.code)).toEqual(expect.arrayContaining(keys));
    expect(cs.concept.find((c) => c.code === "strideLengthM")?.display).toBe("Stride length");
  });
});
