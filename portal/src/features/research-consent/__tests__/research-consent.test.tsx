import { afterEach, describe, expect, it, vi } from "vitest";
import { screen } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { apiError, json, mockApi, renderAtRoute } from "@/testing/feature-test-kit";
import { ConsentHistoryPanel } from "../components/consent-history-panel";
import { PatientConsentPanel } from "../components/patient-consent-panel";

afterEach(() => vi.unstubAllGlobals());

const PID = "3b0f5a1e-2c4d-4e6f-8a9b-1c2d3e4f5a6b";
const CLIN = "7a1b2c3d-4e5f-4a6b-8c7d-9e0f1a2b3c4d";
const URL_STATE = `GET /api/consent/patients/${PID}`;
const URL_EVENTS = `POST /api/consent/patients/${PID}/events`;
const none = { patientId: PID, inForce: false, since: null, awaitingConfirmation: false, events: [] };
const proposal = {
  id: "0c1d2e3f-4a5b-4c6d-8e7f-8091a2b3c4d5",
  kind: "given",
  at: "2026-11-02T10:00:00.000Z",
  recorderRole: "clinician",
  recordedBy: { id: CLIN, displayName: "Tobin Ashgrove" },
  reason: "agreed at the clinic visit",
  counts: false,
};
const awaiting = { ...none, awaitingConfirmation: true, events: [proposal] };
const given = {
  ...none,
  inForce: true,
  since: "2026-11-03T08:00:00.000Z",
  events: [{ ...proposal, id: "1c1d2e3f-4a5b-4c6d-8e7f-8091a2b3c4d5", at: "2026-11-03T08:00:00.000Z", recorderRole: "patient", recordedBy: null, reason: null, counts: true }, proposal],
};

describe("PatientConsentPanel", () => {
  it("asks the patient to confirm a care-team note in plain words, and says declining does not change care", async () => {
    const { calls } = mockApi({ [URL_STATE]: awaiting, [URL_EVENTS]: json(201, given) });
    renderAtRoute(<PatientConsentPanel patientId={PID} />);
    expect(await screen.findByText(/only counts once you confirm it here yourself/)).toBeTruthy();
    expect(screen.getByText(/does not change your care/)).toBeTruthy();
    expect(screen.getByText(/never see your name/)).toBeTruthy();
    await userEvent.click(screen.getByRole("button", { name: "Yes, I confirm" }));
    expect(await screen.findByText(/You said yes on/)).toBeTruthy();
    expect(calls.find((c) => c.method === "POST")?.body).toEqual({ kind: "given" });
  });

  it("withdraws only after a second, explicit step", async () => {
    const { calls } = mockApi({ [URL_STATE]: given, [URL_EVENTS]: json(201, { ...none, events: given.events }) });
    renderAtRoute(<PatientConsentPanel patientId={PID} />);
    await userEvent.click(await screen.findByRole("button", { name: "Stop research use of my walks" }));
    expect(calls.filter((c) => c.method === "POST")).toHaveLength(0);
    expect(screen.getByText(/your new walks will not be used for research/)).toBeTruthy();
    await userEvent.click(screen.getByRole("button", { name: "Yes, stop research use" }));
    expect(await screen.findByText("Your walks are not used for research.")).toBeTruthy();
    expect(calls.find((c) => c.method === "POST")?.body).toEqual({ kind: "withdrawn" });
  });

  it("shows the server's refusal and a load failure", async () => {
    mockApi({ [URL_STATE]: none, [URL_EVENTS]: apiError(409, "consent_unchanged", "research consent is already in force") });
    const { unmount } = renderAtRoute(<PatientConsentPanel patientId={PID} />);
    await userEvent.click(await screen.findByRole("button", { name: "Yes, my walks may be used for research" }));
    expect((await screen.findByRole("alert")).textContent).toContain("already in force");
    unmount();
    mockApi({ [URL_STATE]: apiError(500, "internal", "down") });
    renderAtRoute(<PatientConsentPanel patientId={PID} />);
    expect(await screen.findByText("Your research choice could not be loaded")).toBeTruthy();
  });
});

describe("ConsentHistoryPanel", () => {
  it("lists every change with who recorded it and whether it counts", async () => {
    mockApi({ [URL_STATE]: given });
    renderAtRoute(<ConsentHistoryPanel patientId={PID} role="clinician" />);
    expect(await screen.findByText(/In force since/)).toBeTruthy();
    expect(screen.getByText("Consent given — recorded by the patient")).toBeTruthy();
    expect(screen.getByText("Consent proposed, waiting for the patient — recorded by Tobin Ashgrove, clinician")).toBeTruthy();
    expect(screen.getByText("agreed at the clinic visit")).toBeTruthy();
  });

  it("needs a reason of 10 characters before it sends anything", async () => {
    const { calls } = mockApi({ [URL_STATE]: none, [URL_EVENTS]: json(201, awaiting) });
    renderAtRoute(<ConsentHistoryPanel patientId={PID} role="clinician" />);
    await userEvent.type(await screen.findByLabelText("Reason"), "short");
    await userEvent.click(screen.getByRole("button", { name: "Record" }));
    expect(await screen.findByText(/at least 10 characters/)).toBeTruthy();
    expect(calls.filter((c) => c.method === "POST")).toHaveLength(0);
    await userEvent.type(screen.getByLabelText("Reason"), " — patient agreed at the visit");
    await userEvent.click(screen.getByRole("button", { name: "Record" }));
    expect(await screen.findByText(/Waiting for the patient/)).toBeTruthy();
    expect(calls.find((c) => c.method === "POST")?.body).toEqual({ kind: "given", reason: "short — patient agreed at the visit" });
  });
});
