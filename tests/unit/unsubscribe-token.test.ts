import { webcrypto } from "node:crypto";
import { describe, expect, it } from "vitest";
import { signUnsubscribeToken, verifyUnsubscribeToken } from "@/lib/email/unsubscribe-token";

const SECRET = "unit-test-secret-0123456789abcdef";

async function webCryptoHmac(key: Uint8Array, data: string): Promise<Uint8Array> {
  const imported = await webcrypto.subtle.importKey("raw", key, { name: "HMAC", hash: "SHA-256" }, false, ["sign"]);
  return new Uint8Array(await webcrypto.subtle.sign("HMAC", imported, new TextEncoder().encode(data)));
}

describe("unsubscribe tokens", () => {
  it("are HMAC-SHA256 under a key derived from the secret, as an independent WebCrypto computation gives", async () => {
    // RFC 2104 HMAC with SHA-256 (RFC 4231), computed here with WebCrypto rather than node:crypto's createHmac.
    const token = signUnsubscribeToken({ userId: "user-1", category: "reports" }, SECRET);
    const [payload, signature] = token.split(".") as [string, string];
    expect(JSON.parse(Buffer.from(payload, "base64url").toString("utf8"))).toEqual({ v: 1, u: "user-1", c: "reports" });
    const key = await webCryptoHmac(new TextEncoder().encode(SECRET), "proofbay:email-unsubscribe:v1");
    expect(signature).toBe(Buffer.from(await webCryptoHmac(key, payload)).toString("base64url"));
  });

  it("verify back to the person and category they were made for", () => {
    const token = signUnsubscribeToken({ userId: "user-1", category: "campaign-updates" }, SECRET);
    expect(verifyUnsubscribeToken(token, SECRET)).toEqual({ userId: "user-1", category: "campaign-updates" });
  });

  it("refuse a token whose person was swapped, one signed with another secret, and garbage", () => {
    const token = signUnsubscribeToken({ userId: "user-1", category: "reports" }, SECRET);
    const signature = token.split(".")[1]!;
    const otherPerson = Buffer.from(JSON.stringify({ v: 1, u: "user-2", c: "reports" })).toString("base64url");
    expect(verifyUnsubscribeToken(`${otherPerson}.${signature}`, SECRET)).toBeNull();
    expect(verifyUnsubscribeToken(signUnsubscribeToken({ userId: "user-1", category: "reports" }, "another-secret-0123456789"), SECRET)).toBeNull();
    expect(verifyUnsubscribeToken("", SECRET)).toBeNull();
    expect(verifyUnsubscribeToken("abc", SECRET)).toBeNull();
    expect(verifyUnsubscribeToken(`${token}.x`, SECRET)).toBeNull();
  });

  it("never name account mail, even correctly signed", async () => {
    const payload = Buffer.from(JSON.stringify({ v: 1, u: "user-1", c: "account" })).toString("base64url");
    const key = await webCryptoHmac(new TextEncoder().encode(SECRET), "proofbay:email-unsubscribe:v1");
    const signature = Buffer.from(await webCryptoHmac(key, payload)).toString("base64url");
    expect(verifyUnsubscribeToken(`${payload}.${signature}`, SECRET)).toBeNull();
  });
});
