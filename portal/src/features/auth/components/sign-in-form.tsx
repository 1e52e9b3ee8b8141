import { useState, type FormEvent } from "react";
import { Link, useNavigate, useSearchParams } from "react-router-dom";
import { Button, FormMessage, TextField } from "@/components/ui";
import { isApiError } from "@/lib/api-error";
import { describeError } from "@/lib/api-error";
import { fieldErrors, formValues } from "@/lib/form";
import { safeNextPath } from "../api/auth-keys";
import { SignInInputSchema, useSignIn } from "../api/sign-in";
import { AuthCard } from "./auth-card";

export function SignInForm() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const signIn = useSignIn();
  const [errors, setErrors] = useState<Record<string, string>>({});

  async function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const parsed = SignInInputSchema.safeParse(formValues(e.currentTarget));
    if (!parsed.success) {
      setErrors(fieldErrors(parsed.error));
      return;
    }
    setErrors({});
    try {
      const me = await signIn.mutateAsync(parsed.data);
      navigate(safeNextPath(me.role, params.get("next")), { replace: true });
    } catch {
      /* shown below from the mutation state */
    }
  }

  const failure = signIn.error;
  const failureText =
    failure && isApiError(failure) && failure.status === 401
      ? "That e-mail and password do not match an active account."
      : failure && isApiError(failure) && failure.status === 429
        ? "Too many attempts. Wait a few minutes, then try again."
        : failure
          ? describeError(failure)
          : null;

  return (
    <AuthCard
      title="Sign in to Pendula"
      intro="For patients, clinicians, researchers and administrators of your rehabilitation service."
      footer={
        <>
          <Link to="/reset-password" className="font-semibold text-sky-deep underline underline-offset-2">
            Forgotten your password?
          </Link>{" "}
          New here? Use the link in your invitation e-mail.
        </>
      }
    >
      <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Sign in">
        {failureText ? <FormMessage tone="error">{failureText}</FormMessage> : null}
        <TextField label="E-mail" name="email" type="email" autoComplete="username" required error={errors.email} />
        <TextField label="Password" name="password" type="password" autoComplete="current-password" required error={errors.password} />
        <Button type="submit" size="lg" busy={signIn.isPending}>
          Sign in
        </Button>
      </form>
    </AuthCard>
  );
}
