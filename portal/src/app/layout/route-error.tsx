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

// What browsers and Vite's preload helper throw when a screen's chunk cannot be fetched: Chromium
// "Failed to fetch dynamically imported module", Firefox "error loading dynamically imported
// module", WebKit "Importing a module script failed", Vite "Unable to preload CSS".
const CHUNK_LOAD = /dynamically imported module|importing a module script failed|unable to preload css/i;

/** True when the error is a screen's code that did not arrive (connection dropped, or Pendula was updated meanwhile). */
export function isChunkLoadError(error: unknown): boolean {
  return error instanceof Error && CHUNK_LOAD.test(error.message);
}

/** Shown when a loader or a screen throws; keeps the person inside the app with a way forward. */
export function RouteError() {
  const error = useRouteError();
  if (isRouteErrorResponse(error) && error.status === 404) return <NotFound />;
  if (isChunkLoadError(error)) {
    // The browser's own message names a hashed file, which helps nobody; reloading fetches the current files.
    return (
      <div className="mx-auto max-w-xl p-6">
        <ErrorState
          title="This page could not be loaded"
          error={new Error("Part of Pendula did not arrive, usually because the connection dropped or Pendula was updated a moment ago. Reloading the page fetches it again; anything already saved stays saved.")}
          onRetry={() => window.location.reload()}
        />
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-xl p-6">
      <ErrorState title="Something went wrong on this page" error={error} onRetry={() => window.location.reload()} />
    </div>
  );
}
