/**
 * What only HTTP shows, against the built server (`next start`): security headers on pages, API and static files,
 * Origin refusal before any route runs, body limits with chunked bodies, proxy headers not trusted, sign-in lock.
 */
import { request as httpRequest, type IncomingHttpHeaders } from "node:http";
import { join } from "node:path";
import { createClient } from "@libsql/client";
import { describe, expect, test } from "vitest";
import { inject } from "vitest";
import { baseUrl, demoUser } from "./helpers";

interface Raw {
  status: number;
  headers: IncomingHttpHeaders;
  body: string;
}

/** One HTTP request with full control of headers and body; `chunks` are written with Transfer-Encoding: chunked unless a length is given. */
function raw(method: string, path: string, headers: Record<string, string>, chunks: AsyncIterable<Uint8Array> | null = null): Promise<Raw & { sent: number }> {
  const url = new URL(path, baseUrl());
  return new Promise((resolve, reject) => {
    let sent = 0;
    let answered = false; // the answer's headers arrived: stop sending the body
    let done = false; // the whole answer was read: later socket errors no longer matter
    const req = httpRequest({ method, hostname: url.hostname, port: url.port, path: url.pathname + url.search, headers, agent: false }, (res) => {
      answered = true;
      const parts: Buffer[] = [];
      res.on("data", (c: Buffer) => parts.push(c));
      res.on("end", () => {
        done = true;
        resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(parts).toString("utf8"), sent });
      });
    });
    req.on("error", (err) => (done ? undefined : reject(err)));
    void (async () => {
      try {
        if (chunks) {
          for await (const c of chunks) {
            if (answered || req.destroyed) break;
            sent += c.byteLength;
            if (!req.write(c)) await new Promise((r) => req.once("drain", r));
          }
        }
        req.end();
      } catch {
        // the server closed the connection after answering early
      }
    })();
  });
}

/**
 * A request the server answers before the body is sent (a 413 mid-upload). The server stops reading and closes the
 * connection; bytes the client still sends then draw a TCP reset, which can erase the answer from the client's
 * receive buffer before it is read — the hazard RFC 9112 §9.6 ("Tear-down") describes for servers that close at
 * once. Tried up to three times when the connection is reset before any answer arrived; the first answer read counts.
 */
async function rawEarlyAnswer(method: string, path: string, headers: Record<string, string>, body: () => AsyncIterable<Uint8Array>): Promise<Raw & { sent: number }> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await raw(method, path, headers, body());
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code;
      if (attempt >= 3 || (code !== "EPIPE" && code !== "ECONNRESET")) throw err;
    }
  }
}

async function* zeros(total: number, chunk = 256 * 1024): AsyncIterable<Uint8Array> {
  const c = new Uint8Array(chunk);
  for (let sent = 0; sent < total; sent += chunk) yield c;
}

async function signIn(role: "lab" | "consultant" | "field"): Promise<string> {
  const u = demoUser(role);
  const res = await fetch(`${baseUrl()}/api/auth/sign-in/email`, { method: "POST", headers: { "content-type": "application/json", origin: baseUrl() }, body: JSON.stringify({ email: u.email, password: u.password }) });
  expect(res.status).toBe(200);
  return res.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
}

async function demoProjectId(cookie: string): Promise<string> {
  const r = await fetch(`${baseUrl()}/api/projects`, { headers: { cookie } });
  return ((await r.json()) as { items: { id: string }[] }).items[0].id;
}

describe("security headers", () => {
  test("a page carries a nonce CSP whose nonce is on every script tag, plus frame, referrer, nosniff and permissions headers", async () => {
    const res = await raw("GET", "/sign-in", {});
    expect(res.status).toBe(200);
    const csp = String(res.headers["content-security-policy"]);
    const nonce = /'nonce-([^']+)'/.exec(csp)?.[1];
    expect(nonce).toBeTruthy();
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("'strict-dynamic'");
    const scripts = [...res.body.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
    expect(scripts.length).toBeGreaterThan(0);
    for (const s of scripts) expect(s).toContain(`nonce="${nonce}"`);
    expect(res.headers["x-frame-options"]).toBe("DENY");
    expect(res.headers["x-content-type-options"]).toBe("nosniff");
    expect(res.headers["referrer-policy"]).toBe("strict-origin-when-cross-origin");
    expect(res.headers["permissions-policy"]).toMatch(/geolocation=\(self\).*camera=\(self\)/);
    expect(res.headers["strict-transport-security"]).toBeUndefined(); // plain HTTP here: HSTS only over HTTPS
    const again = await raw("GET", "/sign-in", {});
    expect(/'nonce-([^']+)'/.exec(String(again.headers["content-security-policy"]))?.[1]).not.toBe(nonce);
  });

  test("API responses and static files carry them too", async () => {
    const api = await raw("GET", "/api/health", {});
    expect(api.headers["content-security-policy"]).toContain("default-src 'none'");
    expect(api.headers["x-content-type-options"]).toBe("nosniff");
    const asset = await raw("GET", "/leaflet/marker-icon.png", {});
    expect(asset.headers["x-content-type-options"]).toBe("nosniff");
    expect(asset.headers["x-frame-options"]).toBe("DENY");
  });

  test("HSTS is sent only when a trusted proxy says the request came over HTTPS — not when any client says so", async () => {
    const res = await raw("GET", "/sign-in", { "x-forwarded-proto": "https" });
    expect(res.status).toBe(200);
    expect(res.headers["strict-transport-security"]).toBeUndefined(); // LITHODEX_TRUSTED_PROXY_HOPS is not set here
    expect(String(res.headers["content-security-policy"])).not.toContain("upgrade-insecure-requests");
  });
});

describe("Origin", () => {
  test("a cross-site POST with a text/plain body is refused (403) before its body is read", async () => {
    const cookie = await signIn("field");
    const projectId = await demoProjectId(cookie);
    const res = await raw("POST", `/api/projects/${projectId}/stations`, { cookie, origin: "http://evil.example", "content-type": "text/plain" }, zeros(10, 10));
    expect(res.status).toBe(403);
    expect(res.body).toContain("evil.example");
    const plain = await raw("POST", `/api/projects/${projectId}/stations`, { cookie, origin: baseUrl(), "content-type": "text/plain", "content-length": "2" }, zeros(2, 2));
    expect(plain.status).toBe(415);
  });
});

describe("body limits over HTTP", () => {
  test("a consultant declaring a 200 MB scan upload gets 403 without the server waiting for the body", async () => {
    const cookie = await signIn("consultant");
    const projectId = await demoProjectId(cookie);
    const started = Date.now();
    const res = await rawEarlyAnswer("POST", `/api/projects/${projectId}/scans`, { cookie, "content-type": "multipart/form-data; boundary=x", "content-length": String(200 * 1024 * 1024) }, () => zeros(1024 * 1024));
    expect(res.status).toBe(403);
    expect(Date.now() - started).toBeLessThan(10_000);
  });

  test("a lab analyst's chunked 80 MB scan upload is answered 413 after about 50 MiB, and the server keeps answering", async () => {
    const cookie = await signIn("lab");
    const projectId = await demoProjectId(cookie);
    const res = await rawEarlyAnswer("POST", `/api/projects/${projectId}/scans`, { cookie, "content-type": "multipart/form-data; boundary=x", "transfer-encoding": "chunked" }, () => zeros(80 * 1024 * 1024));
    expect(res.status).toBe(413);
    expect(res.body).toContain("payload_too_large");
    const health = await raw("GET", "/api/health", {});
    expect(health.status).toBe(200);
  }, 60_000);

  test("a chunked JSON body over 1 MiB is 413", async () => {
    const cookie = await signIn("field");
    const projectId = await demoProjectId(cookie);
    const res = await rawEarlyAnswer("POST", `/api/projects/${projectId}/stations`, { cookie, "content-type": "application/json", "transfer-encoding": "chunked" }, () => zeros(3 * 1024 * 1024));
    expect(res.status).toBe(413);
  });
});

describe("proxy headers and sign-in throttling", () => {
  test("X-Forwarded-For from a client is not taken as its address (the audit log records the TCP peer)", async () => {
    const res = await raw("POST", "/api/auth/sign-in/email", { "content-type": "application/json", origin: baseUrl(), "x-forwarded-for": "198.51.100.77" }, (async function* () {
      yield new TextEncoder().encode(JSON.stringify({ email: "xff-probe@lithodex.example", password: "wrong-password" }));
    })());
    expect(res.status).toBe(401);
    const db = createClient({ url: `file:${join(inject("dataDir"), "e2e.db")}` });
    const { rows } = await db.execute({ sql: "SELECT after_json FROM audit_log WHERE entity = 'account' AND entity_id = ? ORDER BY created_at DESC LIMIT 1", args: ["xff-probe@lithodex.example"] });
    db.close();
    const after = JSON.parse(String(rows[0].after_json)) as { address: string };
    expect(after.address).not.toBe("198.51.100.77");
    expect(after.address).toMatch(/^(127\.0\.0\.1|::1|0000:0000:0000:0000::\/64)$/);
  });

  test("repeated failures lock the account (429 with Retry-After) whatever X-Forwarded-For says", async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 11; i++) {
      const res = await fetch(`${baseUrl()}/api/auth/sign-in/email`, {
        method: "POST",
        headers: { "content-type": "application/json", origin: baseUrl(), "x-forwarded-for": `203.0.113.${i}` },
        body: JSON.stringify({ email: "lock-probe@lithodex.example", password: "wrong-password" }),
      });
      statuses.push(res.status);
      if (res.status === 429) expect(Number(res.headers.get("retry-after"))).toBeGreaterThan(60);
    }
    expect(statuses.slice(0, 10).every((s) => s === 401)).toBe(true);
    expect(statuses[10]).toBe(429);
  }, 90_000);
});
