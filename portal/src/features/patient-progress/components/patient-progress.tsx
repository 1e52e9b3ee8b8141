import { Link } from "react-router-dom";
import { TimeSeriesChart } from "@/components/charts/time-series-chart";
import { Badge, buttonClasses, EmptyState, PageHeader, Section, Table, Td, Th } from "@/components/ui";
import { useMyWalks } from "../api/get-my-walks";
import { progressWords, SPEED_CAUTION } from "./progress-words";
import { metricDefinition } from "@pendula/ingest-server/contracts";

// The patient's own words for the two measures shown here, from the metric catalogue.
const CADENCE = metricDefinition("cadenceStepsPerMin")!.patientLabel!;
const SPEED = metricDefinition("walkingSpeedMPerS")!.patientLabel!;

const dateWords = (iso: string) => new Date(iso).toLocaleDateString(undefined, { weekday: "short", day: "numeric", month: "long", year: "numeric" });

export function PatientProgress({ patientId }: { patientId: string }) {
  const { data } = useMyWalks(patientId);
  const done = data.items.filter((w) => w.status === "done");
  const words = progressWords(done);
  const cadencePoints = done
    .filter((w) => typeof w.cadenceStepsPerMin === "number")
    .map((w) => ({ key: w.id, t: new Date(w.recordedAt), v: w.cadenceStepsPerMin! }))
    .sort((a, b) => a.t.getTime() - b.t.getTime());

  return (
    <div>
      <PageHeader eyebrow="Over the weeks" title="Your progress">
        How your weekly walks have gone. Your care team looks at these with you and will explain what they mean for you.
      </PageHeader>

      {data.items.length === 0 ? (
        <EmptyState
          title="No walks yet"
          action={
            <Link to="/patient" className={buttonClasses("primary")}>
              Do this week's walk
            </Link>
          }
        >
          After your first weekly walk is measured, you will see it here.
        </EmptyState>
      ) : (
        <>
          <Section title="In short" id="summary">
            <div className="card flex flex-col gap-2 p-5 text-[1.05rem]">
              <p>
                You have {words.walks === 1 ? "one measured walk" : `${words.walks} measured walks`} so far.
              </p>
              {words.cadence ? <p>{words.cadence}</p> : null}
              {words.rhythm ? <p>{words.rhythm}</p> : null}
              {words.speed ? <p>{words.speed}</p> : null}
              {words.speed ? <p className="text-ink-soft">{SPEED_CAUTION}</p> : null}
              <p className="text-ink-soft">If anything about your walking worries you, talk to your care team. Numbers from one week alone can vary for many ordinary reasons.</p>
            </div>
          </Section>

          {cadencePoints.length >= 2 ? (
            <Section title={CADENCE} id="cadence" description="Each dot is one weekly walk.">
              <figure className="card p-4">
                <TimeSeriesChart
                  ariaLabel={`${CADENCE} in each weekly walk`}
                  series={[{ id: "cadence", label: CADENCE, points: cadencePoints, color: "var(--color-moss)" }]}
                  formatY={(v) => v.toFixed(0)}
                  height={240}
                />
                <figcaption className="mt-2 text-sm text-ink-soft">The same numbers are in the list below.</figcaption>
              </figure>
            </Section>
          ) : null}

          <Section title="Your walks" id="walks">
            <Table>
              <thead>
                <tr>
                  <Th>Date</Th>
                  <Th>{CADENCE}</Th>
                  <Th>{SPEED}</Th>
                  <Th>Status</Th>
                </tr>
              </thead>
              <tbody>
                {[...data.items]
                  .sort((a, b) => b.recordedAt.localeCompare(a.recordedAt))
                  .map((w) => (
                    <tr key={w.id}>
                      <Td>{dateWords(w.recordedAt)}</Td>
                      <Td className="tabular">{typeof w.cadenceStepsPerMin === "number" ? Math.round(w.cadenceStepsPerMin) : "—"}</Td>
                      <Td className="tabular">{typeof w.walkingSpeedMPerS === "number" ? `${w.walkingSpeedMPerS.toFixed(1)} m/s` : "—"}</Td>
                      <Td>
                        {w.status === "done" ? (
                          <Badge tone="good">Measured</Badge>
                        ) : w.status === "failed" ? (
                          <Badge tone="caution">Your care team will look at it</Badge>
                        ) : (
                          <Badge tone="info">Being measured</Badge>
                        )}
                      </Td>
                    </tr>
                  ))}
              </tbody>
            </Table>
          </Section>
        </>
      )}
    </div>
  );
}
