import express from "express";
import request from "supertest";
import { describe, expect, it } from "vitest";
import { proxyWarning } from "../proxy-warning";

function app(trustProxy: boolean, warnings: string[]) {
  const a = express();
  a.use(proxyWarning(trustProxy, (m) => warnings.push(m)));
  a.get("/x", (_req, res) => void res.json({ ok: true }));
  return a;
}

describe("proxyWarning(trustProxy)", () => {
  it("warns once when a forwarded request arrives without TRUST_PROXY", async () => {
    const warnings: string[] = [];
    const a = app(false, warnings);
    await request(a).get("/x");
    expect(warnings).toHaveLength(0);
    await request(a).get("/x").set("X-Forwarded-For", "203.0.113.7");
    await request(a).get("/x").set("Forwarded", "for=203.0.113.8");
    expect(warnings).toHaveLength(1);
    expect(warnings[0]).toContain("TRUST_PROXY");
  });

  it("also notices the standard Forwarded header (RFC 7239)", async () => {
    const warnings: string[] = [];
    await request(app(false, warnings)).get("/x").set("Forwarded", "for=203.0.113.8;proto=https");
    expect(warnings).toHaveLength(1);
  });

  it("stays quiet when TRUST_PROXY is set", async () => {
    const warnings: string[] = [];
    await request(app(true, warnings)).get("/x").set("X-Forwarded-For", "203.0.113.7");
    expect(warnings).toHaveLength(0);
  });
});
