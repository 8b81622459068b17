import { describe, expect, it } from "vitest";
import { parseEnv } from "@/lib/env";

describe("parseEnv", () => {
  it("derives the fake services' ports from PORT so two demos can run side by side", () => {
    const env = parseEnv({ PORT: "4000" });
    expect(env.appUrl).toBe("http://localhost:4000");
    expect(env.smtp.port).toBe(4001);
    expect(env.inboxPort).toBe(4002);
  });

  it("lets SMTP settings point at a real provider", () => {
    const env = parseEnv({ SMTP_HOST: "smtp.mail.example", SMTP_PORT: "587", SMTP_USER: "lab", SMTP_PASSWORD: "pw" });
    expect(env.smtp).toMatchObject({ host: "smtp.mail.example", port: 587, user: "lab", password: "pw" });
  });

  it("names the field that is wrong", () => {
    expect(() => parseEnv({ PORT: "seventy" })).toThrow(/PORT/);
  });

  it("refuses demo mode anywhere but localhost", () => {
    expect(parseEnv({ PROOFBAY_DEMO: "1" }).demoMode).toBe(true);
    expect(() => parseEnv({ PROOFBAY_DEMO: "1", APP_URL: "https://lab.example.org" })).toThrow(/demo mode/);
  });
});
