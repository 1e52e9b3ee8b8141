import { afterEach, describe, expect, it, vi } from "vitest";
import { refreshAccessToken, setAccessToken } from "../api-client";

afterEach(() => {
  vi.unstubAllGlobals();
  setAccessToken(null);
});

describe("refresh across tabs", () => {
  it("asks for the refresh under one named Web Lock, so tabs take turns with the rotating cookie", async () => {
    const order: string[] = [];
    const request = vi.fn(async (name: string, fn: () => Promise<unknown>) => {
      order.push(`lock ${name}`);
      const r = await fn();
      order.push("unlock");
      return r;
    });
    vi.stubGlobal("navigator", { ...navigator, locks: { request } });
    vi.stubGlobal(
      "fetch",
      vi.fn(async () => {
        order.push("fetch");
        return new Response(JSON.stringify({ accessToken: "fresh" }), { status: 200, headers: { "Content-Type": "application/json" } });
      }),
    );
    window.localStorage.setItem("pendula.signed-in", "1");
    expect(await refreshAccessToken()).toBe("fresh");
    expect(order).toEqual(["lock pendula-refresh", "fetch", "unlock"]);
  });

  it("still refreshes where the browser has no Web Locks", async () => {
    vi.stubGlobal("navigator", { ...navigator, locks: undefined });
    vi.stubGlobal("fetch", vi.fn(async () => new Response(JSON.stringify({ accessToken: "plain" }), { status: 200 })));
    window.localStorage.setItem("pendula.signed-in", "1");
    expect(await refreshAccessToken()).toBe("plain");
  });
});
