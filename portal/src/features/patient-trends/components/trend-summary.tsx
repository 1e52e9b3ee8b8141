import type { ReactNode } from "react";
import { IconAlert, IconInfo, IconSteady, IconTrendDown, IconTrendUp } from "@/components/icons";
import type { TrendMetric } from "../api/trends";
import { countWords, fmt } from "./trend-family-card";
import { summaryGroups, trendCardId, type BandPosition, type ChangeVerdict, type SummaryRow } from "./trend-summary-model";
import { formatDate } from "@/lib/format";


/** "+0.19 m/s", "−3.0 %", "±0"; a change that rounds to nothing is not given a sign. */
function signed(v: number, rawUnit: string): string {
  const body = fmt(Math.abs(v), rawUnit);
  if (!/[1-9]/.test(body)) return `±${body}`;
  return `${v > 0 ? "+" : "−"}${body}`;
}

// Words first and an icon beside them, so no verdict rests on colour. Icons follow the clinical
// direction (an improved cadence and an improved variability both point up), as on the cards.
const CHANGE: Record<Exclude<ChangeVerdict["kind"], "not-compared">, { words: string; icon: ReactNode; cls: string }> = {
  improved: { words: "Improved beyond MDC", icon: <IconTrendUp />, cls: "text-moss-deep" },
  worsened: { words: "Worsened beyond MDC", icon: <IconTrendDown />, cls: "text-clay-deep" },
  changed: { words: "Changed beyond MDC", icon: <IconAlert />, cls: "text-ochre" },
  within: { words: "Within MDC", icon: <IconSteady />, cls: "text-ink" },
};

function ChangeCell({ verdict }: { verdict: ChangeVerdict }) {
  if (verdict.kind === "not-compared") {
    return (
      <span className="inline-flex items-center gap-1 text-ink-soft">
        <IconInfo className="shrink-0" />
        <span>Not compared ({verdict.reason})</span>
      </span>
    );
  }
  const c = CHANGE[verdict.kind];
  return (
    <span className={`inline-flex items-center gap-1 font-semibold ${c.cls}`}>
      <span aria-hidden="true" className="shrink-0">
        {c.icon}
      </span>
      <span>{c.words}</span>
    </span>
  );
}

// Neutral shapes for where a value sits against a band: a band is a description of a cohort,
// so being inside or outside it is neither good nor bad by itself.
const BAND_GLYPH: Record<BandPosition, string> = { above: "↑", below: "↓", inside: "↔" };
const BAND_WORDS: Record<BandPosition, string> = { above: "Above", below: "Below", inside: "Inside" };

function BandCell({ row }: { row: SummaryRow }) {
  if (row.bands.length === 0) return <span className="text-ink-soft">No published band for this patient</span>;
  return (
    <ul className="flex flex-col">
      {row.bands.map((v) => (
        <li key={v.number}>
          <span aria-hidden="true" className="mr-1 font-bold">
            {BAND_GLYPH[v.position]}
          </span>
          {BAND_WORDS[v.position]} band {v.number}{" "}
          <span className="tabular text-ink-soft">
            ({fmt(v.band.low, "")}–{fmt(v.band.high, row.metric.unit)})
          </span>
        </li>
      ))}
    </ul>
  );
}

function LatestCell({ row, latestDay }: { row: SummaryRow; latestDay: string | null }) {
  const p = row.latest;
  if (!p) return <span className="text-ink-soft">No values yet</span>;
  const when = formatDate(p.recordedAt);
  const extras = [
    countWords(p.n, row.metric.countNoun),
    typeof p.walkingSpeedMPerS === "number" ? `at ${p.walkingSpeedMPerS.toFixed(2)} m/s` : null,
    when !== latestDay ? `on ${when}` : null,
  ].filter(Boolean);
  let value: ReactNode = <span className="tabular font-semibold">{fmt(p.value, row.metric.unit)}</span>;
  if (row.phase) {
    // A mean relative phase means little without its coupling strength, so it is never shown alone.
    value =
      row.couplingR === null ? (
        <span className="text-ink-soft">Phase withheld: no coupling strength R for this session</span>
      ) : (
        <span className="tabular font-semibold">
          {fmt(p.value, row.metric.unit)} (R = {row.couplingR.toFixed(2)})
        </span>
      );
  }
  return (
    <>
      {value}
      {extras.length ? <span className="text-ink-soft"> · {extras.join(" · ")}</span> : null}
    </>
  );
}

function DeltaCell({ row }: { row: SummaryRow }) {
  if (row.delta === null || (row.phase && row.couplingR === null)) return <span className="text-ink-soft">—</span>;
  const mdc = row.metric.mdc;
  return (
    <>
      <span className="tabular">{signed(row.delta, row.metric.unit)}</span>
      {mdc ? <span className="tabular text-ink-soft"> (MDC95 {fmt(mdc.value, row.metric.unit)})</span> : null}
      {row.aidDiffers ? <span className="block text-ochre">Walking aid differs from baseline</span> : null}
    </>
  );
}

const cell = "border-b border-line/70 px-2 py-1 align-top";

/**
 * The page's one-screen overview: for each measure drawn below, the latest value, its change from
 * the patient's baseline with the server's MDC verdict, where it sits against the published bands
 * shown for this patient, and a link down to its chart. Every verdict comes from the trend API's
 * own fields; nothing is recomputed here except the difference from the baseline mean it sends.
 */
export function TrendSummary({ metrics }: { metrics: TrendMetric[] }) {
  const groups = summaryGroups(metrics);
  if (groups.length === 0) return null;
  const latestIso = groups
    .flatMap((g) => g.rows.map((r) => r.latest?.recordedAt ?? ""))
    .reduce((a, b) => (b > a ? b : a), "");
  const latestDay = latestIso ? formatDate(latestIso) : null;

  return (
    <section aria-labelledby="trend-summary-title" className="card mb-6 p-3 sm:p-4">
      <div className="mb-1 flex flex-wrap items-baseline justify-between gap-x-4">
        <h2 id="trend-summary-title" className="text-base font-bold">
          Summary
        </h2>
        <p className="text-xs text-ink-soft">
          {latestDay ? `Latest session ${latestDay} unless a date is given. ` : null}Select a measure to go to its chart.
        </p>
      </div>
      <p role="note" className="mb-2 flex items-start gap-1.5 text-xs">
        <IconAlert className="mt-0.5 shrink-0 text-ochre" />
        <span>
          This summary supports, and does not replace, clinical judgement: a verdict is a prompt to look at the chart and the patient, not a diagnosis. MDC95 says a change is
          probably beyond measurement error, not that it matters clinically. Follow local protocols.
        </span>
      </p>
      <div className="overflow-x-auto">
        <table className="w-full border-collapse text-left text-xs">
          <caption className="sr-only">Latest value of each measure, its change from the patient's baseline against the MDC95, and where it sits against the published reference bands.</caption>
          <thead>
            <tr className="bg-sand">
              <th scope="col" className={`${cell} font-semibold`}>
                Family
              </th>
              <th scope="col" className={`${cell} font-semibold`}>
                Measure
              </th>
              <th scope="col" className={`${cell} font-semibold`}>
                Latest
              </th>
              <th scope="col" className={`${cell} font-semibold`}>
                Change from baseline mean
              </th>
              <th scope="col" className={`${cell} font-semibold`}>
                Against MDC95
              </th>
              <th scope="col" className={`${cell} font-semibold`}>
                Published band for this patient
              </th>
            </tr>
          </thead>
          {groups.map(({ family, rows }) => (
            <tbody key={family.id}>
              {rows.map((row, i) => (
                <tr key={row.metric.key}>
                  {i === 0 ? (
                    <th scope="rowgroup" rowSpan={rows.length} className={`${cell} border-r font-semibold`}>
                      {family.title}
                    </th>
                  ) : null}
                  <th scope="row" className={`${cell} font-normal`}>
                    <a href={`#${trendCardId(family.id)}`} className="text-sky-deep underline underline-offset-2">
                      {row.label}
                    </a>
                  </th>
                  <td className={cell}>
                    <LatestCell row={row} latestDay={latestDay} />
                  </td>
                  <td className={cell}>
                    <DeltaCell row={row} />
                  </td>
                  <td className={cell}>
                    <ChangeCell verdict={row.change} />
                  </td>
                  <td className={cell}>
                    <BandCell row={row} />
                  </td>
                </tr>
              ))}
            </tbody>
          ))}
        </table>
      </div>
    </section>
  );
}
