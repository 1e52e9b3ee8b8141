import { useState, type FormEvent } from "react";
import { ROLES, SEXES } from "@pendula/ingest-server/contracts";
import { Button, FormMessage, SelectField, TextField } from "@/components/ui";
import { describeError } from "@/lib/api-error";
import { localCalendarDay } from "@/lib/calendar-day";
import { CONDITION_OPTIONS } from "@/lib/condition-labels";
import { invitationInputSchema, useCreateInvitation } from "../api/create-invitation";
import { usePatientRecords } from "../api/patient-records";
import { ROLE_LABEL } from "@/lib/role-labels";

const SEX_LABEL: Record<string, string> = { female: "Female", male: "Male", other: "Other", unknown: "Not recorded" };

type Errors = Record<string, string | undefined>;

export function InviteForm() {
  const invite = useCreateInvitation();
  const [email, setEmail] = useState("");
  const [displayName, setDisplayName] = useState("");
  const [role, setRole] = useState("");
  const [patientMode, setPatientMode] = useState<"existing" | "new">("new");
  const [patientId, setPatientId] = useState("");
  const [birthYear, setBirthYear] = useState("");
  const [sex, setSex] = useState("");
  const [condition, setCondition] = useState("");
  const [enrolledOn, setEnrolledOn] = useState(() => localCalendarDay());
  const [researchConsent, setResearchConsent] = useState(false);
  const [researchConsentReason, setResearchConsentReason] = useState("");
  const [errors, setErrors] = useState<Errors>({});
  const isPatient = role === "patient";
  const records = usePatientRecords(isPatient && patientMode === "existing");

  function submit(event: FormEvent) {
    event.preventDefault();
    const parsed = invitationInputSchema.safeParse({
      email,
      displayName,
      role,
      patientMode,
      patientId,
      patient: { birthYear, sex, condition, enrolledOn, researchConsent, researchConsentReason },
    });
    if (!parsed.success) {
      const next: Errors = {};
      for (const issue of parsed.error.issues) next[issue.path.join(".")] ??= issue.message;
      return setErrors(next);
    }
    setErrors({});
    invite.mutate(parsed.data, {
      onSuccess: () => {
        setEmail("");
        setDisplayName("");
      },
    });
  }

  return (
    <form onSubmit={submit} noValidate aria-labelledby="invite-heading" className="card grid gap-4 p-5">
      <h2 id="invite-heading" className="text-lg font-bold text-ink">
        Invite someone
      </h2>
      <p className="text-sm text-ink-soft">
        The person receives an e-mail with a link that sets their password once. The link expires if it is not used.
      </p>
      <div className="grid gap-4 md:grid-cols-3">
        <TextField label="E-mail" type="email" autoComplete="off" value={email} onChange={(e) => setEmail(e.target.value)} error={errors.email} />
        <TextField label="Display name" value={displayName} onChange={(e) => setDisplayName(e.target.value)} error={errors.displayName} />
        <SelectField label="Role" value={role} onChange={(e) => setRole(e.target.value)} error={errors.role}>
          <option value="">Choose a role</option>
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABEL[r]}
            </option>
          ))}
        </SelectField>
      </div>

      {isPatient ? (
        <fieldset className="grid gap-4 rounded-lg border border-line p-4">
          <legend className="px-1 text-sm font-bold text-ink">Patient record</legend>
          <div className="flex flex-wrap gap-4">
            <label className="flex items-center gap-2 text-ink">
              <input type="radio" name="patientMode" className="accent-moss" checked={patientMode === "new"} onChange={() => setPatientMode("new")} />
              Create a new record
            </label>
            <label className="flex items-center gap-2 text-ink">
              <input
                type="radio"
                name="patientMode"
                className="accent-moss"
                checked={patientMode === "existing"}
                onChange={() => setPatientMode("existing")}
              />
              Link an existing record
            </label>
          </div>
          {patientMode === "existing" ? (
            <div className="max-w-md">
              <SelectField
                label="Existing patient"
                value={patientId}
                onChange={(e) => setPatientId(e.target.value)}
                error={records.isError ? describeError(records.error) : errors.patientId}
                hint={records.isPending ? "Loading patient records…" : undefined}
              >
                <option value="">Choose the patient record</option>
                {(records.data ?? []).map((p) => (
                  <option key={p.id} value={p.id}>
                    {p.displayName}
                  </option>
                ))}
              </SelectField>
            </div>
          ) : (
            <div className="grid gap-4 md:grid-cols-4">
              <TextField label="Year of birth" inputMode="numeric" value={birthYear} onChange={(e) => setBirthYear(e.target.value)} error={errors["patient.birthYear"]} />
              <SelectField label="Sex" value={sex} onChange={(e) => setSex(e.target.value)} error={errors["patient.sex"]}>
                <option value="">Choose</option>
                {SEXES.map((s) => (
                  <option key={s} value={s}>
                    {SEX_LABEL[s] ?? s}
                  </option>
                ))}
              </SelectField>
              <SelectField label="Condition" value={condition} onChange={(e) => setCondition(e.target.value)} error={errors["patient.condition"]}>
                <option value="">Choose</option>
                {CONDITION_OPTIONS.map((c) => (
                  <option key={c.value} value={c.value}>
                    {c.label}
                  </option>
                ))}
              </SelectField>
              <TextField label="Enrolled on" type="date" value={enrolledOn} onChange={(e) => setEnrolledOn(e.target.value)} error={errors["patient.enrolledOn"]} />
              <label className="flex items-center gap-2 text-ink md:col-span-4">
                <input type="checkbox" className="size-4 accent-moss" checked={researchConsent} onChange={(e) => setResearchConsent(e.target.checked)} />
                The patient has given written research consent (only then do their anonymised metrics reach research exports)
              </label>
              {researchConsent ? (
                <TextField
                  className="md:col-span-4"
                  label="What the consent rests on"
                  hint="Recorded in the patient's consent history; the patient can withdraw it in their portal at any time."
                  value={researchConsentReason}
                  onChange={(e) => setResearchConsentReason(e.target.value)}
                  error={errors["patient.researchConsentReason"]}
                  maxLength={500}
                />
              ) : null}
            </div>
          )}
        </fieldset>
      ) : null}

      {invite.isError ? <FormMessage tone="error">The invitation was not sent: {describeError(invite.error)}</FormMessage> : null}
      {invite.isSuccess ? (
        <FormMessage tone="success">
          Invitation created for {invite.data.email}.{" "}
          {invite.data.emailSent ? "The e-mail is on its way." : "The e-mail could not be sent; send it again from the pending list later."}
        </FormMessage>
      ) : null}
      <div>
        <Button type="submit" busy={invite.isPending}>
          Send invitation
        </Button>
      </div>
    </form>
  );
}
