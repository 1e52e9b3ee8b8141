import { Suspense } from "react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { screen } from "@testing-library/react";
import { trainingList } from "@pendula/ingest-server/contracts";
import { conforming, testUuid } from "@/testing/contract-fixtures";
import { mockApi, renderAtRoute } from "@/testing/feature-test-kit";
import { NotesPanel } from "../components/notes-panel";

const PATIENT = "5c1f2a9e-7b3d-4e8a-9f60-1d2c3b4a5e6f";
let previousTz: string | undefined;
beforeEach(() => {
  previousTz = process.env.TZ;
});
afterEach(() => {
  vi.unstubAllGlobals();
  if (previousTz === undefined) delete process.env.TZ;
  else process.env.TZ = previousTz;
});

describe("NotesPanel", () => {
  it("shows a training day as the day it was logged, even where noon UTC is already tomorrow", async () => {
    // Pacific/Kiritimati is UTC+14 all year (IANA tz database): noon UTC on 5 January is 02:00 on 6 January there.
    process.env.TZ = "Pacific/Kiritimati";
    expect(new Date("2026-01-05T12:00:00Z").getDate()).toBe(6); // the shift the panel must not make
    mockApi({
      [`GET /api/patients/${PATIENT}/notes`]: { items: [] },
      [`GET /api/patients/${PATIENT}/training`]: conforming(trainingList, {
        items: [
          {
            id: testUuid(1, "70000000"),
            patientId: PATIENT,
            authorId: testUuid(2, "0000aaaa"),
            performedOn: "2026-01-05",
            kind: "treadmill",
            minutes: 30,
            description: null,
            createdAt: "2026-01-05T15:00:00.000Z",
          },
        ],
      }),
    });
    renderAtRoute(
      <Suspense fallback={<p>loading</p>}>
        <NotesPanel patientId={PATIENT} />
      </Suspense>,
    );
    expect(await screen.findByText(/Treadmill, 30 min/)).toBeTruthy();
    const day = new Intl.DateTimeFormat(undefined, { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" }).format(Date.UTC(2026, 0, 5));
    expect(screen.getByText(day)).toBeTruthy();
    expect(screen.queryByText(/\b6\b.*Jan|Jan.*\b6\b/)).toBeNull();
  });
});
