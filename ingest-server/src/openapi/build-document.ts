import { z } from "zod";
import type { EndpointRecord } from "../http/api-router";
import { errorBody } from "../contracts/common";

type JsonSchema = Record<string, unknown>;

function schemaOf(type: z.ZodType, io: "input" | "output"): JsonSchema {
  // `unrepresentable: "any"` keeps the document whole if a schema holds a transform or refinement.
  const { $schema: _drop, ...rest } = z.toJSONSchema(type, { io, unrepresentable: "any", target: "draft-2020-12" }) as JsonSchema;
  return rest;
}

const toOpenApiPath = (p: string) => p.replace(/:([A-Za-z0-9_]+)/g, "{$1}");

function parameters(record: EndpointRecord): JsonSchema[] {
  const out: JsonSchema[] = [];
  for (const [where, type] of [["path", record.request.params], ["query", record.request.query]] as const) {
    if (!type) continue;
    const schema = schemaOf(type, "input");
    const props = (schema.properties ?? {}) as Record<string, JsonSchema>;
    const required = new Set((schema.required as string[] | undefined) ?? []);
    for (const [name, s] of Object.entries(props)) {
      out.push({ name, in: where, required: where === "path" || required.has(name), schema: s });
    }
  }
  // Path parameters without a params schema still have to appear in the document.
  for (const m of record.path.matchAll(/:([A-Za-z0-9_]+)/g)) {
    if (!out.some((p) => p.in === "path" && p.name === m[1])) {
      out.push({ name: m[1], in: "path", required: true, schema: { type: "string" } });
    }
  }
  return out;
}

/** OpenAPI 3.1 from the endpoint records; JSON Schema 2020-12 is OpenAPI 3.1's own dialect. */
export function buildOpenApiDocument(records: EndpointRecord[], info: { title: string; version: string }): JsonSchema {
  const paths: Record<string, Record<string, JsonSchema>> = {};
  const error = { description: "error", content: { "application/json": { schema: schemaOf(errorBody, "output") } } };
  for (const r of records) {
    const path = toOpenApiPath(r.path);
    const op: JsonSchema = {
      summary: r.summary,
      operationId: `${r.method}${path.replace(/[{}]/g, "").replace(/[^A-Za-z0-9]+(.)?/g, (_m, c: string | undefined) => (c ? c.toUpperCase() : ""))}`,
      "x-pendula-access": typeof r.access === "string" ? r.access : { scopes: r.access.scopes },
      parameters: parameters(r),
      responses: {
        [String(r.status)]: r.response
          ? { description: "success", content: { "application/json": { schema: schemaOf(r.response, "output") } } }
          : r.produces
            ? { description: "success", content: { [r.produces]: {} } }
            : { description: "success" },
        "4XX": error,
        default: error,
      },
    };
    if (r.access !== "public") op.security = [{ bearer: [] }];
    if (r.request.body) {
      op.requestBody = { required: true, content: { "application/json": { schema: schemaOf(r.request.body, "input") } } };
    }
    (paths[path] ??= {})[r.method] = op;
  }
  return {
    openapi: "3.1.0",
    info,
    paths,
    components: { securitySchemes: { bearer: { type: "http", scheme: "bearer", bearerFormat: "JWT" } } },
  };
}
