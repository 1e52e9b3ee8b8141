import type { ErrorRequestHandler, Request } from "express";
import type { Knex } from "knex";
import type { AppDeps } from "../deps";
import { HttpError } from "../http-error";
import { auditRow } from "./audit";

/**
 * Refused requests on patient resources (403 outside one's scopes, 404 outside one's reach) leave
 * an audit row, so probing ids leaves a trace. Only the refused path pays for it: the row is written
 * by an error middleware after the access check failed, never inside the allowed read.
 *
 * A flood must not fill the table: per signed-in account, the first `perWindow` refusals of a
 * window are written one by one, the rest are counted and written as one `access.refused_coalesced`
 * row when the window closes. Counters live in the process (like the rate limits), so with several
 * server processes each writes its own rows; a process that stops mid-window loses at most that
 * window's count of coalesced refusals (the individual rows before it are already written).
 */

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Endpoints whose refusals are audited: everything under a patient or one of their sessions. */
export function isPatientScopedPath(fullPath: string): boolean {
  return /^\/api\/(patients|sessions)(\/|$)/.test(fullPath) || /\/patients\/:/.test(fullPath);
}

export interface CoalescerOptions {
  /** Refusals written individually per account and window. */
  perWindow: number;
  windowMs: number;
}

export const DEFAULT_REFUSAL_LIMITS: CoalescerOptions = { perWindow: 10, windowMs: 60_000 };

export interface CoalescedSummary {
  actorId: string;
  actorRole: string;
  count: number;
  windowStart: number;
  windowEnd: number;
}

interface ActorWindow {
  start: number;
  written: number;
  suppressed: number;
  role: string;
}

/**
 * Decides, per account, whether a refusal is written now or counted; `take()` hands back the
 * counts of windows that have closed. Pure bookkeeping with an injected clock, so it is tested
 * without a database or timers.
 */
export class RefusalCoalescer {
  private readonly windows = new Map<string, ActorWindow>();
  private closed: CoalescedSummary[] = [];

  constructor(
    public options: CoalescerOptions,
    private readonly now: () => number = Date.now,
  ) {}

  /** True when this refusal gets a row of its own. */
  admit(actorId: string, actorRole: string): boolean {
    const t = this.now();
    let w = this.windows.get(actorId);
    if (w && t - w.start >= this.options.windowMs) {
      if (w.suppressed > 0) this.closed.push(summaryOf(actorId, w, this.options.windowMs));
      w = undefined;
    }
    if (!w) {
      if (this.windows.size >= 1000) this.sweep(t, false);
      w = { start: t, written: 0, suppressed: 0, role: actorRole };
      this.windows.set(actorId, w);
    }
    if (w.written < this.options.perWindow) {
      w.written++;
      return true;
    }
    w.suppressed++;
    return false;
  }

  /** Summaries of closed windows with counted refusals (or of every window when `all`). */
  take(all = false): CoalescedSummary[] {
    this.sweep(this.now(), all);
    const out = this.closed;
    this.closed = [];
    return out;
  }

  private sweep(t: number, all: boolean): void {
    for (const [actorId, w] of this.windows) {
      if (all || t - w.start >= this.options.windowMs) {
        if (w.suppressed > 0) this.closed.push(summaryOf(actorId, w, this.options.windowMs));
        this.windows.delete(actorId);
      }
    }
  }

  /** Accounts with an open window (bounded: closed windows are swept once there are many). */
  get size(): number {
    return this.windows.size;
  }

  /** When the earliest open window with counted refusals closes (ms since epoch), if any. */
  nextClose(): number | undefined {
    let next: number | undefined;
    for (const w of this.windows.values()) {
      if (w.suppressed > 0 && (next === undefined || w.start + this.options.windowMs < next)) next = w.start + this.options.windowMs;
    }
    return next;
  }
}

function summaryOf(actorId: string, w: ActorWindow, windowMs: number): CoalescedSummary {
  return { actorId, actorRole: w.role, count: w.suppressed, windowStart: w.start, windowEnd: w.start + windowMs };
}

/** Writes refusal rows for one application (one per AppDeps), coalescing floods per account. */
export class RefusalRecorder {
  readonly coalescer: RefusalCoalescer;
  private timer: NodeJS.Timeout | undefined;

  constructor(
    private readonly db: Knex,
    options: CoalescerOptions = DEFAULT_REFUSAL_LIMITS,
    now: () => number = Date.now,
  ) {
    this.coalescer = new RefusalCoalescer({ ...options }, now);
  }

  async record(req: Request, err: HttpError, route: { method: string; path: string }): Promise<void> {
    const auth = req.auth;
    if (!auth) return;
    if (!this.coalescer.admit(auth.userId, auth.role)) {
      this.schedule();
      return;
    }
    const rawId = typeof req.params?.id === "string" ? req.params.id : null;
    const id = rawId && UUID.test(rawId) ? rawId : null;
    const sessionPath = route.path.startsWith("/api/sessions/:id");
    const row = auditRow(req, {
      action: "access.refused",
      resourceType: sessionPath ? "session" : "patient",
      resourceId: rawId ? rawId.slice(0, 64) : null,
      details: {
        requestId: req.id ?? null,
        route: `${route.method.toUpperCase()} ${route.path}`,
        status: err.status,
        code: err.code,
      },
    });
    // The patient is named only when the id is a real patient (or session) id: the column keeps its
    // foreign key, and a probe for a made-up id keeps that id in resource_id.
    const patientId = !id
      ? null
      : sessionPath
        ? this.db.raw("(SELECT patient_id FROM walk_sessions WHERE id = ?)", [id])
        : route.path.includes("/patients/:id")
          ? this.db.raw("(SELECT id FROM patients WHERE id = ?)", [id])
          : null;
    await this.db("audit_events").insert({ ...row, patient_id: patientId });
  }

  /** Writes the rows of closed windows (all windows when `all`, e.g. at shutdown or in a test). */
  async flush(all = false): Promise<number> {
    const summaries = this.coalescer.take(all);
    if (summaries.length === 0) return 0;
    await this.db("audit_events").insert(
      summaries.map((s) =>
        auditRow(null, {
          action: "access.refused_coalesced",
          resourceType: "access",
          actorId: s.actorId,
          actorRole: s.actorRole,
          details: {
            count: s.count,
            from: new Date(s.windowStart).toISOString(),
            to: new Date(s.windowEnd).toISOString(),
            writtenIndividually: this.coalescer.options.perWindow,
          },
        }),
      ),
    );
    return summaries.length;
  }

  private schedule(): void {
    if (this.timer) return;
    const at = this.coalescer.nextClose();
    if (at === undefined) return;
    this.timer = setTimeout(
      () => {
        this.timer = undefined;
        this.flush()
          .catch((e: unknown) => console.error("[audit] coalesced refusals not written:", e))
          .finally(() => this.schedule());
      },
      Math.max(0, at - Date.now()) + 5,
    );
    // A pending summary must not keep a finished process (or test run) alive.
    this.timer.unref();
  }
}

const recorders = new WeakMap<AppDeps, RefusalRecorder>();

/** The recorder shared by every router of one application. */
export function refusalRecorderFor(deps: AppDeps): RefusalRecorder {
  let r = recorders.get(deps);
  if (!r) {
    r = new RefusalRecorder(deps.db);
    recorders.set(deps, r);
  }
  return r;
}

/**
 * Route-level error middleware: records a 403/404 of a signed-in caller, then passes the error on
 * unchanged to the one error handler. A failed audit insert is logged, never turned into a 500.
 */
export function auditRefusals(deps: AppDeps, route: { method: string; path: string }): ErrorRequestHandler {
  return async (err, req, _res, next) => {
    if (err instanceof HttpError && (err.status === 403 || err.status === 404) && req.auth) {
      try {
        await refusalRecorderFor(deps).record(req, err, route);
      } catch (e) {
        console.error(`[${req.id ?? "-"}] refused request not audited:`, e);
      }
    }
    next(err);
  };
}
