/** Origin check, client address, sign-in throttle and CSP building (issue 12). */
import { describe, expect, test } from "vitest";
import { clientAddress, normalise, PEER_HEADER } from "@/lib/security/client-address";
import { pageCsp } from "@/lib/security/headers";
import { checkOrigin } from "@/lib/security/origin";
import { ACCOUNT_RULE, ADDRESS_RULE, SignInThrottle } from "@/lib/security/throttle";

const self = "http://localhost:3000";
const trusted = new Set(["https://field.example.org"]);

describe("Origin check on state-changing requests (OWASP CSRF Prevention Cheat Sheet)", () => {
  test("another site's Origin is refused, this site and TRUSTED_ORIGINS pass", () => {
    expect(checkOrigin("POST", new Headers({ origin: "http://evil.example" }), self, trusted).ok).toBe(false);
    expect(checkOrigin("PATCH", new Headers({ origin: self }), self, trusted).ok).toBe(true);
    expect(checkOrigin("DELETE", new Headers({ origin: "https://field.example.org" }), self, trusted).ok).toBe(true);
  });
  test("safe methods are never refused; a missing Origin passes unless the browser says cross-site", () => {
    expect(checkOrigin("GET", new Headers({ origin: "http://evil.example" }), self, trusted).ok).toBe(true);
    expect(checkOrigin("POST", new Headers(), self, trusted).ok).toBe(true);
    expect(checkOrigin("POST", new Headers({ "sec-fetch-site": "cross-site" }), self, trusted).ok).toBe(false);
    expect(checkOrigin("POST", new Headers({ origin: "null" }), self, trusted).ok).toBe(false);
  });
  test("a look-alike host (same prefix, other port) is another origin (RFC 6454 §4)", () => {
    expect(checkOrigin("POST", new Headers({ origin: "http://localhost:3001" }), self, trusted).ok).toBe(false);
    expect(checkOrigin("POST", new Headers({ origin: "http://localhost:3000.evil.example" }), self, trusted).ok).toBe(false);
  });
});

describe("real client address", () => {
  test("without trusted proxies X-Forwarded-For is ignored and the stamped peer address is used", () => {
    const h = new Headers({ "x-forwarded-for": "9.9.9.9", [PEER_HEADER]: "::ffff:10.0.0.7" });
    expect(clientAddress(h, 0)).toBe("10.0.0.7");
  });
  test("with one trusted proxy the right-most X-Forwarded-For entry counts (entries to its left are client-written)", () => {
    const h = new Headers({ "x-forwarded-for": "1.1.1.1, 2.2.2.2, 203.0.113.9", [PEER_HEADER]: "127.0.0.1" });
    expect(clientAddress(h, 1)).toBe("203.0.113.9");
    expect(clientAddress(h, 2)).toBe("2.2.2.2");
  });
  test("IPv6 clients are keyed on their /64 (RFC 4291 interface identifiers are the host's to choose)", () => {
    expect(normalise("2001:db8:1:2:aaaa::1")).toBe("2001:0db8:0001:0002::/64");
    expect(normalise("2001:db8:1:2:bbbb::9")).toBe(normalise("2001:db8:1:2:aaaa::1"));
  });
});

describe("sign-in throttle", () => {
  test("free failures, then a doubling delay, then a lock after ACCOUNT_RULE.lockAfter failures", () => {
    const t = new SignInThrottle();
    const keys: [string, typeof ACCOUNT_RULE][] = [["acct:a@x", ACCOUNT_RULE]];
    let now = 1_000_000;
    for (let i = 0; i < ACCOUNT_RULE.free; i++) {
      expect(t.check(keys, now).delayMs).toBe(0);
      t.fail(keys, now++);
    }
    expect(t.check(keys, now).delayMs).toBe(ACCOUNT_RULE.baseDelayMs);
    t.fail(keys, now++);
    expect(t.check(keys, now).delayMs).toBe(ACCOUNT_RULE.baseDelayMs * 2);
    for (let i = ACCOUNT_RULE.free + 1; i < ACCOUNT_RULE.lockAfter; i++) t.fail(keys, now++);
    const v = t.check(keys, now);
    expect(v.locked).toBe(true);
    expect(v.retryAfterMs).toBeGreaterThan(ACCOUNT_RULE.lockMs - 100);
    expect(t.check(keys, now + ACCOUNT_RULE.lockMs + ACCOUNT_RULE.windowMs).locked).toBe(false);
  });
  test("rotating the account does not escape the address key, and a success clears only the account", () => {
    const t = new SignInThrottle();
    const now = 5_000_000;
    for (let i = 0; i < ADDRESS_RULE.lockAfter; i++) t.fail([[`addr:1.2.3.4`, ADDRESS_RULE], [`acct:u${i}@x`, ACCOUNT_RULE]], now);
    expect(t.check([[`addr:1.2.3.4`, ADDRESS_RULE], ["acct:fresh@x", ACCOUNT_RULE]], now).locked).toBe(true);
    t.succeed("acct:u1@x");
    expect(t.check([[`addr:1.2.3.4`, ADDRESS_RULE]], now).locked).toBe(true);
    expect(t.check([[`addr:5.6.7.8`, ADDRESS_RULE], ["acct:u1@x", ACCOUNT_RULE]], now).locked).toBe(false);
  });
});

describe("page CSP", () => {
  test("scripts need this request's nonce; never framed; HTTPS upgrade only over HTTPS", () => {
    const csp = pageCsp("abc123");
    expect(csp).toContain("script-src 'self' 'nonce-abc123' 'strict-dynamic'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).not.toContain("unsafe-eval");
    expect(csp).not.toContain("upgrade-insecure-requests");
    expect(pageCsp("n", { https: true })).toContain("upgrade-insecure-requests");
  });
});
