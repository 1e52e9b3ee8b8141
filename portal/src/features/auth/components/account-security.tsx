import { useState, type FormEvent } from "react";
import { Link } from "react-router-dom";
import { z } from "zod";
import { Button, ErrorState, FormMessage, LoadingState, PageHeader, Section, TextField } from "@/components/ui";
import { describeError, isApiError } from "@/lib/api-error";
import { fieldErrors, formValues } from "@/lib/form";
import { formatLongDate } from "@/lib/format";
import { SECOND_FACTOR_SETUP_PATH } from "../api/auth-keys";
import { useRegenerateRecoveryCodes, useRemoveSecondFactor, useSecondFactorStatus } from "../api/second-factor";
import { TotpCodeSchema } from "../api/sign-in";
import { RecoveryCodesList } from "./recovery-codes-list";

const CodeForm = z.object({ code: TotpCodeSchema });

function codeError(err: unknown): string {
  return isApiError(err) && err.code === "invalid_code"
    ? "That code is not right, or was already used. Enter the code your app shows now."
    : describeError(err);
}

/** One small form that asks for a current code before a change. */
function CodeConfirmForm({ label, action, variant = "secondary", busy, error, onCode }: { label: string; action: string; variant?: "secondary" | "danger"; busy: boolean; error: unknown; onCode: (code: string) => void }) {
  const [errors, setErrors] = useState<Record<string, string>>({});
  function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const parsed = CodeForm.safeParse(formValues(e.currentTarget));
    if (!parsed.success) return setErrors(fieldErrors(parsed.error));
    setErrors({});
    onCode(parsed.data.code);
  }
  return (
    <form noValidate onSubmit={onSubmit} className="flex max-w-sm flex-col gap-3" aria-label={action}>
      {error ? <FormMessage tone="error">{codeError(error)}</FormMessage> : null}
      <TextField label={label} name="code" inputMode="numeric" autoComplete="one-time-code" maxLength={7} error={errors.code} />
      <Button type="submit" variant={variant} busy={busy}>
        {action}
      </Button>
    </form>
  );
}

export function AccountSecurity() {
  const status = useSecondFactorStatus();
  const regenerate = useRegenerateRecoveryCodes();
  const remove = useRemoveSecondFactor();

  if (status.isPending) return <LoadingState label="Loading your sign-in security…" />;
  if (status.isError) return <ErrorState error={status.error} onRetry={() => void status.refetch()} />;
  const s = status.data;

  if (regenerate.data) {
    return (
      <div className="mx-auto max-w-xl">
        <RecoveryCodesList codes={regenerate.data} onDone={() => regenerate.reset()} doneLabel="Back to account security" />
      </div>
    );
  }

  return (
    <div className="mx-auto max-w-2xl">
      <PageHeader title="Account security" eyebrow="Your account" />
      <Section
        title="Authenticator app"
        description={
          s.required
            ? "Staff accounts always sign in with a password and a 6-digit code. If your phone is lost, use a recovery code and ask an administrator to reset the app."
            : "Optional for patients: a 6-digit code from your phone in addition to your password."
        }
      >
        {s.enrolled ? (
          <div className="flex flex-col gap-6">
            <p className="text-ink">
              <span className="font-semibold">On</span>
              {s.enrolledAt ? ` since ${formatLongDate(s.enrolledAt)}` : ""}.
              {" "}Recovery codes left: <span className="font-semibold">{s.recoveryCodesLeft}</span> of 10.
            </p>
            {s.recoveryCodesLeft <= 3 ? (
              <FormMessage tone="error">
                {s.recoveryCodesLeft === 0
                  ? "You have no recovery codes: without your phone you could not sign in. Make new ones and store them safely."
                  : "Few recovery codes are left. Make new ones and store them safely."}
              </FormMessage>
            ) : null}
            <div>
              <h3 className="font-semibold text-ink">New recovery codes</h3>
              <p className="mb-3 text-sm text-ink-soft">Makes 10 new codes; the old ones stop working.</p>
              <CodeConfirmForm label="Current code from your app" action="Make new recovery codes" busy={regenerate.isPending} error={regenerate.error} onCode={(c) => regenerate.mutate(c)} />
            </div>
            {!s.required ? (
              <div>
                <h3 className="font-semibold text-ink">Turn off</h3>
                <p className="mb-3 text-sm text-ink-soft">Your password alone will then sign you in.</p>
                {remove.isSuccess ? <FormMessage tone="success">The authenticator app is turned off.</FormMessage> : null}
                <CodeConfirmForm label="Current code from your app" action="Turn off the authenticator app" variant="danger" busy={remove.isPending} error={remove.error} onCode={(c) => remove.mutate(c)} />
              </div>
            ) : null}
          </div>
        ) : (
          <div className="flex flex-col gap-3">
            <p className="text-ink">
              <span className="font-semibold">Off.</span> Your password alone signs you in.
            </p>
            <Link to={SECOND_FACTOR_SETUP_PATH} className="self-start font-semibold text-sky-deep underline underline-offset-2">
              Set up an authenticator app
            </Link>
          </div>
        )}
      </Section>
    </div>
  );
}
