import { useState, type FormEvent } from "react";
import { Link, useSearchParams } from "react-router-dom";
import { Button, FormMessage, TextField } from "@/components/ui";
import { describeError, isApiError } from "@/lib/api-error";
import { fieldErrors, formValues } from "@/lib/form";
import { NewPasswordSchema, useAcceptInvitation } from "../api/passwords";
import { AuthCard } from "./auth-card";

export function AcceptInvitationForm() {
  const [params] = useSearchParams();
  const token = params.get("token");
  const accept = useAcceptInvitation();
  const [errors, setErrors] = useState<Record<string, string>>({});

  if (!token) {
    return (
      <AuthCard title="Invitation link incomplete">
        <p className="text-ink-soft">
          This link is missing its code. Open the link from your invitation e-mail again, or ask whoever invited you to send a new one.
        </p>
      </AuthCard>
    );
  }

  if (accept.isSuccess) {
    return (
      <AuthCard title="Your account is ready">
        <FormMessage tone="success">Your password is set.</FormMessage>
        <p className="mt-4">
          <Link to="/sign-in" className="font-semibold text-sky-deep underline underline-offset-2">
            Continue to sign in
          </Link>
        </p>
      </AuthCard>
    );
  }

  async function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const parsed = NewPasswordSchema.safeParse(formValues(e.currentTarget));
    if (!parsed.success) return setErrors(fieldErrors(parsed.error));
    setErrors({});
    accept.mutate({ token: token!, password: parsed.data.password });
  }

  const err = accept.error;
  return (
    <AuthCard title="Set up your Pendula account" intro="Choose a password. The invitation link works once and expires.">
      <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Accept invitation">
        {err ? (
          <FormMessage tone="error">
            {isApiError(err) && (err.status === 410 || err.status === 404 || err.code.includes("expired"))
              ? "This invitation has expired or was already used. Ask whoever invited you to send a new one."
              : describeError(err)}
          </FormMessage>
        ) : null}
        <TextField label="New password" name="password" type="password" autoComplete="new-password" hint="At least 10 characters." error={errors.password} />
        <TextField label="Type it again" name="confirm" type="password" autoComplete="new-password" error={errors.confirm} />
        <Button type="submit" size="lg" busy={accept.isPending}>
          Set password
        </Button>
      </form>
    </AuthCard>
  );
}
