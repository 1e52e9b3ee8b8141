import express from "express";
import request from "supertest";
import { describe, expect, it } from "vitest";
import { allowedHosts, hostName } from "../allowed-hosts";

function app() {
  const a = express();
  a.use(allowedHosts(["gait.clinic.example", "127.0.0.1", "localhost"]));
  a.get("/x", (_req, res) => void res.json({ ok: true }));
  return a;
}

describe("hostName(header)", () => {
  it("drops the port and lower-cases; keeps IPv6 brackets", () => {
    expect(hostName("Gait.Clinic.Example:443")).toBe("gait.clinic.example");
    expect(hostName("127.0.0.1:8641")).toBe("127.0.0.1");
    expect(hostName("[::1]:8641")).toBe("[::1]");
    expect(hostName("localhost")).toBe("localhost");
  });

  it("gives undefined for an absent or malformed header", () => {
    for (const bad of [undefined, "", "a b", "host:port", "evil.example/path", "user@host", "host:123456"]) {
      expect(hostName(bad), String(bad)).toBeUndefined();
    }
  });
});

describe("allowedHosts(names)", () => {
  it("answers for the listed names on any port", async () => {
    for (const host of ["gait.clinic.example", "GAIT.clinic.example:443", "127.0.0.1:8641", "localhost:5173"]) {
      const res = await request(app()).get("/x").set("Host", host);
      expect(res.status, host).toBe(200);
    }
  });

  it("refuses another name (a DNS-rebinding page) with 421 and a JSON reason", async () => {
    const res = await request(app()).get("/x").set("Host", "attacker.example:8641");
    expect(res.status).toBe(421);
    expect(res.body.error.code).toBe("host_not_allowed");
    expect(res.body.error.message).toContain("attacker.example");
  });

  it("refuses a look-alike that only starts or ends with an allowed name", async () => {
    for (const host of ["gait.clinic.example.attacker.example", "x.gait.clinic.example", "127.0.0.1.nip.io"]) {
      expect((await request(app()).get("/x").set("Host", host)).status, host).toBe(421);
    }
  });

  it("refuses a malformed Host header", async () => {
    const res = await request(app()).get("/x").set("Host", "bad host");
    expect(res.status).toBe(421);
    expect(res.body.error.message).toContain("no valid Host header");
  });
});
