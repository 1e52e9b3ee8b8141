import { Link, NavLink, Outlet, useNavigate, useNavigation, useOutlet } from "react-router-dom";
import { IconPendula, IconSignOut } from "@/components/icons";
import { Button, ClinicalNotice, EmptyState, LoadingState } from "@/components/ui";
import { needsSecondFactorSetup, type Role } from "@/features/auth/api/auth-keys";
import { useMe } from "@/features/auth/api/get-me";
import { useSignOut } from "@/features/auth/api/sign-in";
import { ROLE_LABEL } from "@/lib/role-labels";
import { adminNav } from "../routes/admin";
import type { NavItem } from "../routes/nav";
import { researcherNav } from "../routes/researcher";

const NAV: Record<Role, NavItem[]> = {
  patient: [
    { to: "/patient", label: "This week's walk", end: true },
    { to: "/patient/progress", label: "My progress" },
  ],
  clinician: [{ to: "/clinician", label: "Caseload", end: true }],
  researcher: researcherNav,
  admin: adminNav,
};

export function SkipLink() {
  return (
    <a
      href="#main"
      className="skip-link sr-only z-50 rounded-lg bg-ink px-4 py-2 font-semibold text-sand focus:not-sr-only focus:fixed focus:left-3 focus:top-3"
    >
      Skip to main content
    </a>
  );
}

/**
 * While the next screen's code and data load, React Router keeps the current screen on view. This
 * says so: a live region announces "Loading…" to screen readers, and a thin bar pinned to the top
 * edge shows it to everyone else (fixed, so nothing on the page moves; it fades in after a moment
 * so quick changes do not flicker).
 */
export function NavigationStatus() {
  const busy = useNavigation().state !== "idle";
  return (
    <>
      <div role="status" aria-live="polite" className="sr-only">
        {busy ? "Loading…" : ""}
      </div>
      <div
        aria-hidden="true"
        data-busy={busy}
        className={`no-print pointer-events-none fixed inset-x-0 top-0 z-50 h-1 bg-clay transition-opacity ${busy ? "opacity-100 delay-150" : "opacity-0"}`}
      />
    </>
  );
}

export function SiteFooter() {
  return (
    <footer className="mt-auto border-t border-line bg-sand-deep/60">
      <div className="mx-auto max-w-6xl px-4 py-4 sm:px-6">
        <ClinicalNotice />
      </div>
    </footer>
  );
}

export function AppShell() {
  const { data: me } = useMe();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const outlet = useOutlet();
  const settingUp = needsSecondFactorSetup(me);
  // Until a staff account has its second factor, there is nowhere else to go.
  const items = me && !settingUp ? NAV[me.role] : [];

  return (
    <div className="flex min-h-dvh flex-col">
      <SkipLink />
      <NavigationStatus />
      <header className="no-print border-b border-ink/20 bg-ink text-sand">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3 sm:px-6">
          <span className="flex items-center gap-2 text-lg font-bold tracking-tight">
            <IconPendula className="text-clay" width="1.4em" height="1.4em" />
            Pendula
          </span>
          <nav aria-label="Main" className="flex-1">
            <ul className="flex flex-wrap gap-1">
              {items.map((item) => (
                <li key={item.to}>
                  <NavLink
                    to={item.to}
                    end={item.end}
                    className={({ isActive }) =>
                      `block rounded-md px-3 py-1.5 text-sm font-semibold ${
                        isActive ? "bg-sand text-ink" : "text-sand/85 hover:bg-white/10 hover:text-sand"
                      }`
                    }
                  >
                    {item.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </nav>
          {me ? (
            <div className="flex items-center gap-3 text-sm">
              <span className="text-sand/85">
                <span className="font-semibold text-sand">{me.displayName || me.email}</span>
                <span className="ml-1.5 rounded bg-white/10 px-1.5 py-0.5 text-xs">{ROLE_LABEL[me.role]}</span>
              </span>
              {settingUp ? null : (
                <Link to="/account/security" className="rounded-md px-2 py-1 font-semibold text-sand/90 hover:bg-white/10 hover:text-sand">
                  Account security
                </Link>
              )}
              <Button
                variant="quiet"
                size="sm"
                className="text-sand/90 hover:bg-white/10 hover:text-sand"
                icon={<IconSignOut />}
                busy={signOut.isPending}
                onClick={() => signOut.mutate(undefined, { onSettled: () => navigate("/sign-in", { replace: true }) })}
              >
                Sign out
              </Button>
            </div>
          ) : null}
        </div>
      </header>
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-6xl flex-1 px-4 py-6 outline-none sm:px-6 sm:py-8">
        {outlet ?? (
          <EmptyState title="Nothing to show here yet">This area of Pendula has no screens for your account at the moment.</EmptyState>
        )}
      </main>
      <SiteFooter />
    </div>
  );
}

export function AuthLayout() {
  return (
    <div className="flex min-h-dvh flex-col bg-sand">
      <SkipLink />
      <NavigationStatus />
      <main id="main" tabIndex={-1} className="flex flex-1 flex-col items-center justify-center gap-6 px-4 py-10 outline-none">
        <p className="flex items-center gap-2 text-xl font-bold text-ink">
          <IconPendula className="text-clay" width="1.5em" height="1.5em" />
          Pendula
        </p>
        <Outlet />
      </main>
      <SiteFooter />
    </div>
  );
}

export function PendingPage() {
  return <LoadingState label="Loading this page…" />;
}
