import { useState, type FormEvent } from "react";
import { Link, useNavigate, useSearchParams } from "react-router-dom";
import { Button, FormMessage, TextField } from "@/components/ui";
import { isApiError } from "@/lib/api-error";
import { describeError } from "@/lib/api-error";
import { fieldErrors, formValues } from "@/lib/form";
import { needsSecondFactorSetup, safeNextPath, SECOND_FACTOR_SETUP_PATH, type Me } from "../api/auth-keys";
import { SignInInputSchema, useSignIn } from "../api/sign-in";
import { AuthCard } from "./auth-card";
import { SecondFactorStep } from "./second-factor-step";

export function SignInForm() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const signIn = useSignIn();
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [challenge, setChallenge] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);

  function goOn(me: Me) {
    if (needsSecondFactorSetup(me)) navigate(SECOND_FACTOR_SETUP_PATH, { replace: true });
    else navigate(safeNextPath(me.role, params.get("next")), { replace: true });
  }

  async function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const parsed = SignInInputSchema.safeParse(formValues(e.currentTarget));
    if (!parsed.success) {
      setErrors(fieldErrors(parsed.error));
      return;
    }
    setErrors({});
    setNotice(null);
    try {
      const result = await signIn.mutateAsync(parsed.data);
      if (result.kind === "second-factor") setChallenge(result.challenge);
      else goOn(result.me);
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

  if (challenge) {
    return (
      <AuthCard title="Enter your sign-in code" intro="Your password is right. Open your authenticator app and enter the code it shows for Pendula.">
        <SecondFactorStep
          challenge={challenge}
          onSignedIn={goOn}
          onRestart={(why) => {
            signIn.reset();
            setChallenge(null);
            setNotice(why);
          }}
        />
      </AuthCard>
    );
  }

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
        {notice ? <FormMessage tone="error">{notice}</FormMessage> : null}
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
