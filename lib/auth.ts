import { betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { nextCookies } from "better-auth/next-js";
import { APIError, createAuthMiddleware } from "better-auth/api";
import { admin } from "better-auth/plugins";
import { passwordProblem } from "@/lib/security/password";
import { getDb, type Db } from "@/db";
import * as schema from "@/db/schema";

function makeAuth(db: Db) {
  return betterAuth({
    appName: "Lithodex",
    baseURL: process.env.BETTER_AUTH_URL || "http://localhost:3000",
    secret: process.env.BETTER_AUTH_SECRET || "lithodex-dev-secret-change-me-in-production-0123456789",
    database: drizzleAdapter(db, { provider: "sqlite", schema }),
    emailAndPassword: { enabled: true, minPasswordLength: 12, maxPasswordLength: 128, disableSignUp: process.env.LITHODEX_OPEN_SIGNUP !== "1" },
    // The same password rules as invitations and resets (lib/security/password.ts) on better-auth's own endpoints.
    hooks: {
      before: createAuthMiddleware(async (ctx) => {
        if (!["/sign-up/email", "/change-password", "/reset-password"].includes(ctx.path)) return;
        const body = (ctx.body ?? {}) as { password?: unknown; newPassword?: unknown; email?: unknown; name?: unknown };
        const pw = typeof body.newPassword === "string" ? body.newPassword : typeof body.password === "string" ? body.password : null;
        if (pw === null) return;
        const problem = passwordProblem(pw, [body.email, body.name].filter((x): x is string => typeof x === "string"));
        if (problem) throw new APIError("BAD_REQUEST", { message: problem, code: "WEAK_PASSWORD" });
      }),
    },
    plugins: [admin(), nextCookies()],
    telemetry: { enabled: false },
    // Request-rate limit per client address in production (browser tests sign in many times from one address); the
    // address is the real one, resolved in app/api/auth (proxy headers only when LITHODEX_TRUSTED_PROXY_HOPS is set).
    // Failed sign-ins are throttled per account and address separately (lib/dal/sign-in.ts), always.
    rateLimit: { enabled: process.env.NODE_ENV === "production" && process.env.LITHODEX_AUTH_RATE_LIMIT !== "off" },
    advanced: { ipAddress: { ipAddressHeaders: ["x-lithodex-client-ip"] } },
    trustedOrigins: (process.env.TRUSTED_ORIGINS || "http://localhost:3000,http://127.0.0.1:3000").split(","),
  });
}

export type Auth = ReturnType<typeof makeAuth>;

const cache = new WeakMap<Db, Auth>();

/** better-auth bound to the current database (tests switch databases per file). */
export function getAuth(): Auth {
  const db = getDb();
  let auth = cache.get(db);
  if (!auth) {
    auth = makeAuth(db);
    cache.set(db, auth);
  }
  return auth;
}

export const auth = getAuth();
