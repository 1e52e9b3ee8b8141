import { useSearchParams } from "react-router-dom";
import { AcceptInvitationForm, AccountSecurity, ResetConfirmForm, ResetRequestForm, SecondFactorSetup, SignInForm } from "@/features/auth";

export const SignInRoute = () => <SignInForm />;
export const AcceptInvitationRoute = () => <AcceptInvitationForm />;
/** The reset e-mail links to /reset-password?token=…; without a token the page asks for the address. */
export function ResetRequestRoute() {
  const [params] = useSearchParams();
  return params.get("token") ? <ResetConfirmForm /> : <ResetRequestForm />;
}
export const ResetConfirmRoute = () => <ResetConfirmForm />;
export const SecondFactorSetupRoute = () => <SecondFactorSetup />;
export const AccountSecurityRoute = () => <AccountSecurity />;
