export * from "./api/auth-keys";
export * from "./api/get-me";
export * from "./api/sign-in";
export * from "./api/passwords";
export { SignInForm } from "./components/sign-in-form";
export { AcceptInvitationForm } from "./components/accept-invitation-form";
export { ResetRequestForm, ResetConfirmForm } from "./components/password-reset-forms";
