import type { RouteObject } from "react-router-dom";
import { useSearchParams } from "react-router-dom";
import { SignInForm } from "@/features/auth/components/sign-in-form";

/*
 * The sign-in screen is the first thing almost everyone sees, so it ships in the entry chunk.
 * The other account screens are reached from an e-mail link or after signing in; they load with
 * their route, which keeps the QR-code renderer and the recovery-code screens out of the first load.
 * Deep imports (not the feature's index) so the bundler can leave the rest of the feature behind.
 */
export const SignInRoute = () => <SignInForm />;

export const accountRoutes = {
  acceptInvitation: {
    path: "accept-invitation",
    lazy: async () => ({ Component: (await import("@/features/auth/components/accept-invitation-form")).AcceptInvitationForm }),
  },
  resetRequest: {
    path: "reset-password",
    lazy: async () => {
      const { ResetConfirmForm, ResetRequestForm } = await import("@/features/auth/components/password-reset-forms");
      // The reset e-mail links to /reset-password?token=…; without a token the page asks for the address.
      return {
        Component: function ResetRequestRoute() {
          const [params] = useSearchParams();
          return params.get("token") ? <ResetConfirmForm /> : <ResetRequestForm />;
        },
      };
    },
  },
  resetConfirm: {
    path: "reset-password/confirm",
    lazy: async () => ({ Component: (await import("@/features/auth/components/password-reset-forms")).ResetConfirmForm }),
  },
  secondFactorSetup: {
    path: "second-factor/setup",
    lazy: async () => ({ Component: (await import("@/features/auth/components/second-factor-setup")).SecondFactorSetup }),
  },
  accountSecurity: {
    path: "account/security",
    lazy: async () => ({ Component: (await import("@/features/auth/components/account-security")).AccountSecurity }),
  },
} satisfies Record<string, RouteObject>;
