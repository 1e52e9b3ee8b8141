import type { QueryClient } from "@tanstack/react-query";
import { redirect, type LoaderFunctionArgs } from "react-router-dom";
import { needsSecondFactorSetup, ROLE_HOME, SECOND_FACTOR_SETUP_PATH, type Me, type Role } from "@/features/auth/api/auth-keys";
import { meQueryOptions } from "@/features/auth/api/get-me";

async function currentUser(queryClient: QueryClient): Promise<Me | null> {
  return queryClient.ensureQueryData(meQueryOptions());
}

/** Signed-in people only; others go to sign-in with the page to come back to. */
export const requireUser =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs): Promise<Me> => {
    const me = await currentUser(queryClient);
    if (!me) {
      const url = new URL(request.url);
      throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
    }
    // A staff account without its second factor reaches the setup screen and nothing else.
    if (needsSecondFactorSetup(me) && new URL(request.url).pathname !== SECOND_FACTOR_SETUP_PATH) throw redirect(SECOND_FACTOR_SETUP_PATH);
    return me;
  };

/** Where a signed-in person belongs: their home, or the second-factor setup while it is missing. */
const landing = (me: Me) => (needsSecondFactorSetup(me) ? SECOND_FACTOR_SETUP_PATH : ROLE_HOME[me.role]);

/** A signed-in person in the wrong area is sent to their own home, not shown a 403 page. */
export const requireRole =
  (queryClient: QueryClient, role: Role) =>
  async (args: LoaderFunctionArgs): Promise<Me> => {
    const me = await requireUser(queryClient)(args);
    if (me.role !== role) throw redirect(ROLE_HOME[me.role]);
    return me;
  };

/** `/` and the sign-in pages send a signed-in person straight to their home. */
export const redirectSignedIn = (queryClient: QueryClient) => async (): Promise<null> => {
  const me = await currentUser(queryClient).catch(() => null);
  if (me) throw redirect(landing(me));
  return null;
};

export const homeRedirect = (queryClient: QueryClient) => async (): Promise<never> => {
  const me = await currentUser(queryClient).catch(() => null);
  throw redirect(me ? landing(me) : "/sign-in");
};

/**
 * React Router runs a route's loaders in parallel with its parents', so a screen's prefetch would
 * start before the parent guard has redirected a signed-out visitor, and its 401 would land in the
 * browser console. Screen loaders wrapped in this wait for the same (deduplicated) session check and
 * fetch nothing unless the guard is going to let the person in.
 */
export const afterGuard =
  <A extends unknown[]>(queryClient: QueryClient, role: Role, load: (...args: A) => Promise<unknown>) =>
  async (...args: A): Promise<null> => {
    const me = await currentUser(queryClient).catch(() => null);
    if (me?.role === role && !needsSecondFactorSetup(me)) await load(...args);
    return null;
  };
