import { Button } from "@/components/ui";
import { useId, useState, type FormEvent } from "react";
import {
  AGE_BAND_OPTIONS,
  CONDITION_OPTIONS,
  METRIC_OPTIONS,
  cohortDefinitionSchema,
  type CohortDefinition,
} from "../api/cohort-definition";

type FieldErrors = Partial<Record<"conditions" | "ageBands" | "weeksSinceEnrolment" | "metrics", string>>;

interface Props {
  initial: CohortDefinition;
  onSubmit: (definition: CohortDefinition) => void;
  busy?: boolean;
}

function toggle(list: readonly string[], value: string): string[] {
  return list.includes(value) ? list.filter((v) => v !== value) : [...list, value];
}

export function CohortBuilderForm({ initial, onSubmit, busy = false }: Props) {
  const id = useId();
  const [conditions, setConditions] = useState<string[]>(initial.conditions);
  const [ageBands, setAgeBands] = useState<string[]>(initial.ageBands);
  const [weeksFrom, setWeeksFrom] = useState(String(initial.weeksSinceEnrolment.from));
  const [weeksTo, setWeeksTo] = useState(String(initial.weeksSinceEnrolment.to));
  const [metrics, setMetrics] = useState<string[]>(initial.metrics);
  const [errors, setErrors] = useState<FieldErrors>({});

  function submit(event: FormEvent) {
    event.preventDefault();
    const parsed = cohortDefinitionSchema.safeParse({
      conditions,
      // Keep the bands in their natural order whatever order they were ticked in.
      ageBands: AGE_BAND_OPTIONS.filter((b) => ageBands.includes(b)),
      weeksSinceEnrolment: {
        from: weeksFrom.trim() === "" ? Number.NaN : Number(weeksFrom),
        to: weeksTo.trim() === "" ? Number.NaN : Number(weeksTo),
      },
      metrics: METRIC_OPTIONS.map((m) => m.value as string).filter((m) => metrics.includes(m)),
    });
    if (!parsed.success) {
      const next: FieldErrors = {};
      for (const issue of parsed.error.issues) {
        const key = issue.path[0] as keyof FieldErrors;
        next[key] ??= issue.message;
      }
      setErrors(next);
      return;
    }
    setErrors({});
    onSubmit(parsed.data);
  }

  const errorId = (field: keyof FieldErrors) => `${id}-${field}-error`;
  const describedBy = (field: keyof FieldErrors) => (errors[field] ? errorId(field) : undefined);
  const fieldError = (field: keyof FieldErrors) =>
    errors[field] ? (
      <p id={errorId(field)} className="mt-2 text-sm font-semibold text-clay-deep">
        <span aria-hidden="true">⚠ </span>
        {errors[field]}
      </p>
    ) : null;

  const checkboxClass = "size-4 accent-moss";
  const fieldsetClass = "rounded-lg border border-line p-4";
  const legendClass = "px-1 text-sm font-bold text-ink";

  return (
    <form onSubmit={submit} noValidate aria-label="Cohort definition" className="grid gap-5">
      <div className="grid gap-5 md:grid-cols-2">
        <fieldset className={fieldsetClass} aria-describedby={describedBy("conditions")}>
          <legend className={legendClass}>Condition</legend>
          <div className="mt-2 grid gap-2">
            {CONDITION_OPTIONS.map((c) => (
              <label key={c.value} className="flex items-center gap-2 text-ink">
                <input
                  type="checkbox"
                  className={checkboxClass}
                  checked={conditions.includes(c.value)}
                  onChange={() => setConditions((l) => toggle(l, c.value))}
                />
                {c.label}
              </label>
            ))}
          </div>
          {fieldError("conditions")}
        </fieldset>

        <fieldset className={fieldsetClass} aria-describedby={describedBy("weeksSinceEnrolment")}>
          <legend className={legendClass}>Weeks since enrolment</legend>
          <p className="mt-1 text-sm text-ink-soft">Week 0 is the first seven days after a subject enrolled.</p>
          <div className="mt-3 flex flex-wrap items-end gap-4">
            <label className="grid gap-1 text-sm font-semibold text-ink">
              From week
              <input
                type="number"
                inputMode="numeric"
                min={0}
                className="w-28 rounded-md border border-line bg-paper px-3 py-2 font-normal tabular"
                value={weeksFrom}
                onChange={(e) => setWeeksFrom(e.target.value)}
                aria-invalid={errors.weeksSinceEnrolment ? true : undefined}
              />
            </label>
            <label className="grid gap-1 text-sm font-semibold text-ink">
              To week
              <input
                type="number"
                inputMode="numeric"
                min={0}
                className="w-28 rounded-md border border-line bg-paper px-3 py-2 font-normal tabular"
                value={weeksTo}
                onChange={(e) => setWeeksTo(e.target.value)}
                aria-invalid={errors.weeksSinceEnrolment ? true : undefined}
              />
            </label>
          </div>
          {fieldError("weeksSinceEnrolment")}
        </fieldset>
      </div>

      <fieldset className={fieldsetClass} aria-describedby={describedBy("ageBands")}>
        <legend className={legendClass}>Age band at enrolment</legend>
        <div className="mt-2 flex flex-wrap gap-2">
          <Button variant="secondary" size="sm" onClick={() => setAgeBands(AGE_BAND_OPTIONS.slice())}>
            Select all bands
          </Button>
          <Button variant="quiet" size="sm" onClick={() => setAgeBands([])}>
            Clear bands
          </Button>
        </div>
        <div className="mt-3 grid grid-cols-3 gap-2 sm:grid-cols-5 lg:grid-cols-8">
          {AGE_BAND_OPTIONS.map((band) => (
            <label key={band} className="flex items-center gap-2 text-ink tabular">
              <input
                type="checkbox"
                className={checkboxClass}
                checked={ageBands.includes(band)}
                onChange={() => setAgeBands((l) => toggle(l, band))}
              />
              {band}
            </label>
          ))}
        </div>
        {fieldError("ageBands")}
      </fieldset>

      <fieldset className={fieldsetClass} aria-describedby={describedBy("metrics")}>
        <legend className={legendClass}>Metrics</legend>
        <div className="mt-2 grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
          {METRIC_OPTIONS.map((m) => (
            <label key={m.value} className="flex items-center gap-2 text-ink">
              <input
                type="checkbox"
                className={checkboxClass}
                checked={metrics.includes(m.value)}
                onChange={() => setMetrics((l) => toggle(l, m.value))}
              />
              {m.label}
            </label>
          ))}
        </div>
        {fieldError("metrics")}
      </fieldset>

      <div>
        <Button type="submit" busy={busy}>
          Preview cohort
        </Button>
      </div>
    </form>
  );
}
