import { AcceptInvitationForm, ResetConfirmForm, ResetRequestForm, SignInForm } from "@/features/auth";

export const SignInRoute = () => <SignInForm />;
export const AcceptInvitationRoute = () => <AcceptInvitationForm />;
export const ResetRequestRoute = () => <ResetRequestForm />;
export const ResetConfirmRoute = () => <ResetConfirmForm />;
