import { afterEach, describe, expect, it, vi } from "vitest";
import { screen } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { apiError, mockApi, renderAtRoute } from "@/testing/feature-test-kit";
import { MailboxPage } from "../components/mailbox-page";
import { splitLinks } from "../api/message-parts";

afterEach(() => vi.unstubAllGlobals());

describe("splitLinks", () => {
  it("keeps sentence punctuation out of a link and marks the origin", () => {
    const parts = splitLinks("Open http://127.0.0.1:4000/accept-invitation?token=abc. Thanks", "http://127.0.0.1:4000");
    expect(parts).toEqual([
      { kind: "text", text: "Open " },
      { kind: "link", href: "http://127.0.0.1:4000/accept-invitation?token=abc", sameOrigin: true },
      { kind: "text", text: ". Thanks" },
    ]);
  });
  it("returns plain text untouched", () => {
    expect(splitLinks("no links here", "http://x")).toEqual([{ kind: "text", text: "no links here" }]);
  });
});

describe("MailboxPage", () => {
  const origin = window.location.origin;
  const messages = [
    {
      id: "m1",
      receivedAt: "2026-11-30T08:00:00.000Z",
      from: "Pendula <no-reply@pendula.test>",
      to: ["old@brookfield-rehab.test"],
      subject: "Reset your password",
      text: "Reset here: http://elsewhere.test/reset-password/confirm?token=r1",
      html: null,
      headers: { "x-pendula-kind": "password-reset" },
    },
    {
      id: "m2",
      receivedAt: "2026-11-30T09:00:00.000Z",
      from: "Pendula <no-reply@pendula.test>",
      to: ["ivo@home.test"],
      subject: "You are invited to Pendula",
      text: `Welcome.\nSet your password: ${origin}/accept-invitation?token=t2\n`,
      html: "<script>alert(1)</script>",
      headers: { "x-pendula-kind": "invitation" },
    },
  ];

  it("shows the newest message open with its link clickable and never renders the HTML", async () => {
    mockApi({ "GET /api/dev/mailbox": { messages } });
    const { container } = renderAtRoute(<MailboxPage />);
    const headings = await screen.findAllByRole("heading", { level: 2 });
    expect(headings.map((h) => h.textContent)).toEqual(["You are invited to Pendula", "Reset your password"]);
    const link = screen.getByRole("link", { name: `${origin}/accept-invitation?token=t2` });
    expect(link.getAttribute("href")).toBe(`${origin}/accept-invitation?token=t2`);
    expect(container.querySelector("script")).toBeNull();
    // The older message is collapsed until asked for; a foreign link gets an in-portal twin.
    expect(screen.queryByRole("link", { name: "(open in this portal)" })).toBeNull();
    await userEvent.click(screen.getAllByRole("button", { name: "Show message" })[0]!);
    expect(screen.getByRole("link", { name: "(open in this portal)" }).getAttribute("href")).toBe("/reset-password/confirm?token=r1");
  });

  it("shows empty and error states", async () => {
    mockApi({ "GET /api/dev/mailbox": { messages: [] } });
    const first = renderAtRoute(<MailboxPage />);
    expect(await screen.findByText("No messages captured yet")).toBeTruthy();
    first.unmount();
    mockApi({ "GET /api/dev/mailbox": apiError(404, "not_found", "mailbox off") });
    renderAtRoute(<MailboxPage />);
    expect(await screen.findByRole("alert")).toBeTruthy();
  });
});
