import express, { type Request, type RequestHandler, type Response, type Router } from "express";
import type { z } from "zod";
import type { AppDeps } from "../deps";
import { auditRefusals, isPatientScopedPath } from "../audit/refused-access";
import type { Scope } from "../auth/scopes";
import { authenticate, requireAuth, type AuthContext } from "../middleware/authenticate";
import { requireScope } from "../middleware/require-scope";
import { validate } from "../middleware/validate";

export type HttpMethod = "get" | "post" | "put" | "patch" | "delete";

/**
 * Who may call an endpoint. `public`: anyone (sign-in, password reset, health). `authenticated`:
 * any signed-in role (e.g. /api/me). `{ scopes }`: a token holding at least one of them. Finer rules
 * (own patient, caseload) are checked in the service with assertPatientAccess.
 */
export type Access = "public" | "authenticated" | { scopes: Scope[] };

type Out<S> = S extends z.ZodType ? z.output<S> : undefined;

export interface EndpointInput<B, Q, P> {
  body: Out<B>;
  query: Out<Q>;
  params: Out<P>;
  /** Present on every endpoint whose access is not `public`. */
  auth: AuthContext;
}

export interface EndpointSpec<
  B extends z.ZodType | undefined = undefined,
  Q extends z.ZodType | undefined = undefined,
  P extends z.ZodType | undefined = undefined,
> {
  method: HttpMethod;
  /** Relative to the module prefix, Express syntax (`/:id/assignments`). */
  path: string;
  summary: string;
  access: Access;
  request?: { body?: B; query?: Q; params?: P };
  /** Status of a successful answer when the handler returns a value (default 200). */
  status?: number;
  /** Schema of the successful JSON body (a strict contract: an answer with a field it does not name is a 500). */
  response?: z.ZodType;
  /** Non-JSON answers (e.g. text/csv) for the OpenAPI document. */
  produces?: string;
  /** Runs after authentication and before validation (e.g. multer, rate limits). */
  before?: RequestHandler[];
  /**
   * Return a value to answer with `status` and JSON (parsed through `response` when given), or
   * write to `res` yourself and return undefined.
   */
  handler: (input: EndpointInput<B, Q, P>, req: Request, res: Response) => unknown;
}

export interface EndpointRecord {
  method: HttpMethod;
  /** Full path including the module prefix, Express syntax. */
  path: string;
  summary: string;
  access: Access;
  request: { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };
  status: number;
  response?: z.ZodType;
  produces?: string;
}

/**
 * A resource router that records every endpoint it defines. The records feed the OpenAPI document
 * and let a test enumerate every route × method × access rule (nothing is mounted without one).
 */
export class ApiRouter {
  readonly router: Router = express.Router();
  readonly endpoints: EndpointRecord[] = [];
  private readonly auth: RequestHandler;

  constructor(
    readonly prefix: string,
    readonly deps: AppDeps,
  ) {
    this.auth = authenticate(deps.db, deps.config.jwtSecret);
  }

  endpoint<
    B extends z.ZodType | undefined = undefined,
    Q extends z.ZodType | undefined = undefined,
    P extends z.ZodType | undefined = undefined,
  >(spec: EndpointSpec<B, Q, P>): this {
    const chain: RequestHandler[] = [];
    if (spec.access !== "public") chain.push(this.auth);
    if (typeof spec.access === "object") chain.push(requireScope(...spec.access.scopes));
    chain.push(...(spec.before ?? []));
    if (spec.request) chain.push(validate(spec.request));
    const status = spec.status ?? 200;
    chain.push(async (req, res) => {
      const valid = req.valid ?? { body: undefined, query: undefined, params: undefined };
      const input = {
        body: valid.body,
        query: valid.query,
        params: valid.params,
        auth: spec.access === "public" ? (req.auth as AuthContext) : requireAuth(req),
      } as EndpointInput<B, Q, P>;
      const result = await spec.handler(input, req, res);
      if (result === undefined || res.headersSent) {
        if (!res.headersSent) res.status(status === 200 ? 204 : status).end();
        return;
      }
      res.status(status).json(spec.response ? conformResponse(spec.response, result, spec.method, spec.path) : result);
    });
    const fullPath = joinPath(this.prefix, spec.path);
    if (isPatientScopedPath(fullPath)) this.router[spec.method](spec.path, ...chain, auditRefusals(this.deps, { method: spec.method, path: fullPath }));
    else this.router[spec.method](spec.path, ...chain);
    this.endpoints.push({
      method: spec.method,
      path: fullPath,
      summary: spec.summary,
      access: spec.access,
      request: { body: spec.request?.body, query: spec.request?.query, params: spec.request?.params },
      status,
      response: spec.response,
      produces: spec.produces,
    });
    return this;
  }
}

// A handler answering outside its own contract is a server bug (500), not the client's 400.
export function conformResponse(schema: z.ZodType, value: unknown, method: string, path: string): unknown {
  const parsed = schema.safeParse(value);
  if (!parsed.success) {
    throw new Error(`response of ${method.toUpperCase()} ${path} breaks its contract: ${parsed.error.message}`);
  }
  return parsed.data;
}

function joinPath(prefix: string, path: string): string {
  const joined = `${prefix.replace(/\/+$/, "")}/${path.replace(/^\/+/, "")}`;
  return joined.length > 1 ? joined.replace(/\/+$/, "") : joined;
}

/** One entry of the route table in routes/index.ts. */
export interface RouteModule {
  prefix: string;
  router: (deps: AppDeps) => ApiRouter;
}
