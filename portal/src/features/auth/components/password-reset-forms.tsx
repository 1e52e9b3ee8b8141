import { useState, type FormEvent } from "react";
import { Link, useSearchParams } from "react-router-dom";
import { Button, FormMessage, TextField } from "@/components/ui";
import { describeError } from "@/lib/api-error";
import { fieldErrors, formValues } from "@/lib/form";
import { NewPasswordSchema, ResetRequestSchema, useConfirmPasswordReset, useRequestPasswordReset } from "../api/passwords";
import { AuthCard } from "./auth-card";

const backToSignIn = (
  <Link to="/sign-in" className="font-semibold text-sky-deep underline underline-offset-2">
    Back to sign in
  </Link>
);

export function ResetRequestForm() {
  const request = useRequestPasswordReset();
  const [errors, setErrors] = useState<Record<string, string>>({});

  function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const parsed = ResetRequestSchema.safeParse(formValues(e.currentTarget));
    if (!parsed.success) return setErrors(fieldErrors(parsed.error));
    setErrors({});
    request.mutate(parsed.data);
  }

  return (
    <AuthCard title="Reset your password" intro="We will e-mail you a link to choose a new password." footer={backToSignIn}>
      {request.isSuccess ? (
        // The same answer whether or not the address exists, so the form cannot be used to find accounts.
        <FormMessage tone="success">If that address belongs to an account, a reset link is on its way. It expires soon.</FormMessage>
      ) : (
        <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Request password reset">
          {request.error ? <FormMessage tone="error">{describeError(request.error)}</FormMessage> : null}
          <TextField label="E-mail" name="email" type="email" autoComplete="username" error={errors.email} />
          <Button type="submit" size="lg" busy={request.isPending}>
            Send reset link
          </Button>
        </form>
      )}
    </AuthCard>
  );
}

export function ResetConfirmForm() {
  const [params] = useSearchParams();
  const token = params.get("token");
  const confirm = useConfirmPasswordReset();
  const [errors, setErrors] = useState<Record<string, string>>({});

  function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const parsed = NewPasswordSchema.safeParse(formValues(e.currentTarget));
    if (!parsed.success) return setErrors(fieldErrors(parsed.error));
    setErrors({});
    confirm.mutate({ token: token ?? "", password: parsed.data.password });
  }

  if (!token) {
    return (
      <AuthCard title="Reset link incomplete" footer={backToSignIn}>
        <p className="text-ink-soft">This link is missing its code. Open the link from the e-mail again, or request a new one.</p>
      </AuthCard>
    );
  }

  return (
    <AuthCard title="Choose a new password" footer={backToSignIn}>
      {confirm.isSuccess ? (
        <FormMessage tone="success">Your password has been changed. You can sign in with it now.</FormMessage>
      ) : (
        <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Choose a new password">
          {confirm.error ? <FormMessage tone="error">{describeError(confirm.error)}</FormMessage> : null}
          <TextField label="New password" name="password" type="password" autoComplete="new-password" hint="At least 10 characters." error={errors.password} />
          <TextField label="Type it again" name="confirm" type="password" autoComplete="new-password" error={errors.confirm} />
          <Button type="submit" size="lg" busy={confirm.isPending}>
            Change password
          </Button>
        </form>
      )}
    </AuthCard>
  );
}
