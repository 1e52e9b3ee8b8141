import { useState, type FormEvent } from "react";
import { QRCodeSVG } from "qrcode.react";
import { useNavigate } from "react-router-dom";
import { z } from "zod";
import { Button, FormMessage, PageHeader, TextField } from "@/components/ui";
import { describeError, isApiError } from "@/lib/api-error";
import { fieldErrors, formValues } from "@/lib/form";
import { ROLE_HOME } from "../api/auth-keys";
import { useMe } from "../api/get-me";
import { useConfirmEnrolment, useSecondFactorStatus, useStartEnrolment } from "../api/second-factor";
import { TotpCodeSchema } from "../api/sign-in";
import { RecoveryCodesList } from "./recovery-codes-list";

const ConfirmForm = z.object({ code: TotpCodeSchema });

/** The base32 key in groups of four, easier to type into an app by hand. */
const grouped = (secret: string) => secret.replace(/(.{4})/g, "$1 ").trim();

/**
 * Setting up the authenticator app: the server makes the secret; this screen draws its QR code
 * locally (no image service) and shows the same key as text; a first code from the app turns it on.
 */
export function SecondFactorSetup() {
  const navigate = useNavigate();
  const { data: me } = useMe();
  const status = useSecondFactorStatus();
  const start = useStartEnrolment();
  const confirm = useConfirmEnrolment();
  const [errors, setErrors] = useState<Record<string, string>>({});
  const home = me ? ROLE_HOME[me.role] : "/";

  if (confirm.data) {
    return (
      <div className="mx-auto max-w-xl">
        <RecoveryCodesList codes={confirm.data} accountLabel={start.data?.accountLabel} onDone={() => navigate(home, { replace: true })} doneLabel="Continue to Pendula" />
      </div>
    );
  }

  if (status.data?.enrolled) {
    return (
      <div className="mx-auto max-w-xl">
        <PageHeader title="Authenticator app" />
        <p className="text-ink-soft">This account already has an authenticator app. Manage it from your account security page.</p>
        <Button className="mt-4" onClick={() => navigate("/account/security")}>
          Account security
        </Button>
      </div>
    );
  }

  async function onConfirm(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const parsed = ConfirmForm.safeParse(formValues(e.currentTarget));
    if (!parsed.success) return setErrors(fieldErrors(parsed.error));
    setErrors({});
    confirm.mutate(parsed.data.code);
  }

  const required = status.data?.required ?? true;
  const err = confirm.error;
  return (
    <div className="mx-auto max-w-xl">
      <PageHeader title="Set up your authenticator app" eyebrow="Sign-in security">
        {required
          ? "Staff accounts sign in with a password and a 6-digit code from an app on your phone. Set it up once to continue."
          : "Add a 6-digit code from an app on your phone to your sign-in, so a password alone is not enough."}
      </PageHeader>
      <ol className="mt-4 flex list-decimal flex-col gap-3 pl-5 text-ink">
        <li>Install an authenticator app that supports time-based codes (TOTP) on your phone, if you have none yet. Your organisation may name one.</li>
        <li>Show the setup code below and scan it with the app, or type the key by hand.</li>
        <li>Enter the 6-digit code the app then shows for Pendula.</li>
      </ol>

      {!start.data ? (
        <div className="mt-6">
          {start.error ? <FormMessage tone="error">{describeError(start.error)}</FormMessage> : null}
          <Button size="lg" busy={start.isPending} onClick={() => start.mutate()}>
            Show my setup code
          </Button>
        </div>
      ) : (
        <div className="mt-6 flex flex-col gap-5">
          <div className="flex flex-col items-start gap-4 sm:flex-row">
            <div className="rounded-lg border border-line bg-white p-3">
              <QRCodeSVG value={start.data.otpauthUri} size={184} level="M" title="Setup code for your authenticator app" />
            </div>
            <dl className="flex flex-col gap-2 text-sm">
              <div>
                <dt className="font-semibold text-ink">Key (if you cannot scan)</dt>
                <dd className="font-mono text-base tracking-wide text-ink" data-testid="totp-key">
                  {grouped(start.data.secret)}
                </dd>
              </div>
              <div>
                <dt className="font-semibold text-ink">Account</dt>
                <dd className="text-ink-soft">
                  {start.data.issuer} · {start.data.accountLabel}
                </dd>
              </div>
              <div>
                <dt className="font-semibold text-ink">Type</dt>
                <dd className="text-ink-soft">
                  Time-based, {start.data.digits} digits, every {start.data.periodS} seconds
                </dd>
              </div>
            </dl>
          </div>
          <p className="text-sm text-ink-soft">Keep this key private: anyone who has it can make your codes.</p>
          <form noValidate onSubmit={onConfirm} className="flex flex-col gap-4" aria-label="Confirm authenticator app">
            {err ? (
              <FormMessage tone="error">
                {isApiError(err) && err.code === "invalid_code"
                  ? "That code is not right. Check that your phone's clock is set automatically, then enter the code shown now."
                  : describeError(err)}
              </FormMessage>
            ) : null}
            <TextField label="6-digit code from the app" name="code" inputMode="numeric" autoComplete="one-time-code" maxLength={7} error={errors.code} />
            <Button type="submit" size="lg" busy={confirm.isPending}>
              Turn on and show recovery codes
            </Button>
          </form>
        </div>
      )}
    </div>
  );
}
