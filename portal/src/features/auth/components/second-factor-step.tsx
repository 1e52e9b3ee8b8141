import { useState, type FormEvent } from "react";
import { Button, FormMessage, TextField } from "@/components/ui";
import { describeError, isApiError } from "@/lib/api-error";
import { fieldErrors, formValues } from "@/lib/form";
import { z } from "zod";
import type { Me } from "../api/auth-keys";
import { RecoveryCodeSchema, TotpCodeSchema, useCompleteSecondFactor } from "../api/sign-in";

const CodeForm = z.object({ code: TotpCodeSchema });
const RecoveryForm = z.object({ code: RecoveryCodeSchema });

/**
 * Sign-in's second step: the code the authenticator app shows, or one of the printed recovery
 * codes. An expired step (5 minutes, or too many wrong codes) goes back to the password.
 */
export function SecondFactorStep({ challenge, onSignedIn, onRestart }: { challenge: string; onSignedIn: (me: Me) => void; onRestart: (why: string) => void }) {
  const [method, setMethod] = useState<"totp" | "recovery_code">("totp");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const complete = useCompleteSecondFactor();

  async function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const parsed = (method === "totp" ? CodeForm : RecoveryForm).safeParse(formValues(e.currentTarget));
    if (!parsed.success) return setErrors(fieldErrors(parsed.error));
    setErrors({});
    try {
      onSignedIn(await complete.mutateAsync({ challenge, method, code: parsed.data.code }));
    } catch (err) {
      if (isApiError(err) && err.code === "challenge_expired") onRestart("That sign-in step has expired. Enter your e-mail and password again.");
    }
  }

  const err = complete.error;
  const errText = !err
    ? null
    : isApiError(err) && err.code === "code_reused"
      ? "That code was already used. Wait for the next code in your app, then enter it."
      : isApiError(err) && err.code === "invalid_code"
        ? method === "totp"
          ? "That code is not right. Check that your phone's clock is set automatically, then enter the code shown now."
          : "That recovery code is not valid or was already used."
        : isApiError(err) && err.status === 429
          ? "Too many wrong codes. Wait a few minutes, then sign in again."
          : describeError(err);

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Second step of sign-in" key={method}>
      {errText ? <FormMessage tone="error">{errText}</FormMessage> : null}
      {method === "totp" ? (
        <TextField
          label="6-digit code from your authenticator app"
          name="code"
          inputMode="numeric"
          autoComplete="one-time-code"
          autoFocus
          maxLength={7}
          error={errors.code}
          hint="The code changes every 30 seconds."
        />
      ) : (
        <TextField
          label="Recovery code"
          name="code"
          autoComplete="off"
          autoFocus
          spellCheck={false}
          error={errors.code}
          hint="One of the 10 codes you stored when you set up the app. Each works once."
        />
      )}
      <Button type="submit" size="lg" busy={complete.isPending}>
        Verify and sign in
      </Button>
      <button
        type="button"
        className="self-start text-sm font-semibold text-sky-deep underline underline-offset-2"
        onClick={() => {
          complete.reset();
          setMethod(method === "totp" ? "recovery_code" : "totp");
        }}
      >
        {method === "totp" ? "No phone to hand? Use a recovery code" : "Use the code from your authenticator app instead"}
      </button>
    </form>
  );
}
