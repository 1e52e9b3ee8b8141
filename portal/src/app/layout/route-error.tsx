import { isRouteErrorResponse, Link, useRouteError } from "react-router-dom";
import { buttonClasses, EmptyState, ErrorState } from "@/components/ui";

export function NotFound() {
  return (
    <div className="mx-auto max-w-xl p-6">
      <EmptyState
        title="Page not found"
        action={
          <Link to="/" className={buttonClasses("secondary")}>
            Go to your home page
          </Link>
        }
      >
        The address may be mistyped, or the page has moved.
      </EmptyState>
    </div>
  );
}

/** Shown when a loader or a screen throws; keeps the person inside the app with a way forward. */
export function RouteError() {
  const error = useRouteError();
  if (isRouteErrorResponse(error) && error.status === 404) return <NotFound />;
  return (
    <div className="mx-auto max-w-xl p-6">
      <ErrorState title="Something went wrong on this page" error={error} onRetry={() => window.location.reload()} />
    </div>
  );
}
