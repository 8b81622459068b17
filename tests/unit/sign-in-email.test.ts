import { createElement } from "react";
import { describe, expect, it } from "vitest";
import { renderEmail } from "@/emails/render";
import { SignInLinkEmail } from "@/emails/sign-in-link";

describe("sign-in link mail", () => {
  it("has a plain-text part with the link, labelled as account mail and without an unsubscribe link", async () => {
    const url = "http://localhost:3000/sign-in/confirm?token=abc&email=ada%40backers.example";
    const { html, text } = await renderEmail(createElement(SignInLinkEmail, { url, minutesValid: 10 }), { kind: "account" });
    expect(text).toContain(url);
    expect(text).toContain("expires in 10 minutes");
    expect(text).toContain("It is always sent.");
    expect(text).not.toMatch(/unsubscribe/i);
    expect(html).toContain(`href="${url.replace(/&/g, "&amp;")}"`);
  });
});
