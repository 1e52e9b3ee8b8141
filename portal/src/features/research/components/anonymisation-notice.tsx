/**
 * What leaves the server in a research export, in words a data steward can check against
 * HIPAA Safe Harbor (45 CFR 164.514(b)(2)); the rules themselves are applied server-side.
 */
export function AnonymisationNotice({ k = 5 }: { k?: number }) {
  return (
    <section aria-labelledby="anonymisation-heading" className="card p-5">
      <h2 id="anonymisation-heading" className="text-lg font-bold text-ink">
        How this export is anonymised
      </h2>
      <p className="mt-1 text-sm text-ink-soft">
        Only walks recorded while the patient's research consent was in force are included — consent the patient
        confirmed themself, or that an admin recorded with a reason. The rules follow the HIPAA Safe Harbor method,
        45 CFR 164.514(b)(2).
      </p>
      <ul className="mt-3 grid gap-2 text-sm text-ink [&>li]:flex [&>li]:gap-2">
        <li>
          <span aria-hidden="true">•</span>
          <span>
            <strong>Subject codes per project</strong>: a keyed code, stable within one research project, different in
            every other project, that cannot be traced back to a name or record without the server's key.
          </span>
        </li>
        <li>
          <span aria-hidden="true">•</span>
          <span>
            <strong>Week blocks, not dates</strong>: each session is placed in a 4-week block since enrolment (week 52
            and later together); walks of the last 28 days are held back; no calendar dates.
          </span>
        </li>
        <li>
          <span aria-hidden="true">•</span>
          <span>
            <strong>5-year age bands</strong>, with everyone aged 90 or over grouped as <strong>90+</strong>.
          </span>
        </li>
        <li>
          <span aria-hidden="true">•</span>
          <span>
            <strong>Small groups suppressed</strong>: any condition × age band group with fewer than k = {k} subjects is
            withheld and shown only as "suppressed group (n &lt; {k})", without its condition or age band.
          </span>
        </li>
        <li>
          <span aria-hidden="true">•</span>
          <span>
            <strong>Rounded values</strong>: each metric to a clinically meaningful step (see the table under Export).
          </span>
        </li>
        <li>
          <span aria-hidden="true">•</span>
          <span>
            <strong>No device serials and no free text</strong> (clinical notes, training descriptions) ever leave the
            server.
          </span>
        </li>
      </ul>
      <p className="mt-3 text-xs text-ink-faint">
        Gait metrics describe recorded walks; they are not diagnoses. Interpret them with the study protocol and
        clinical expertise.
      </p>
    </section>
  );
}
