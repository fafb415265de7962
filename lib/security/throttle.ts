/**
 * Sign-in throttling (OWASP Authentication Cheat Sheet, "Protect against automated attacks"): failures are counted
 * per account and per real client address; past a few free failures each new attempt waits an exponentially growing
 * delay, and after many failures the key is locked for a while. A success clears the account's count. In memory (one
 * server process); keys expire with their window. Pure: time is passed in.
 */

export interface ThrottleRule {
  /** Failures without any delay. */
  free: number;
  /** Delay after the first paid failure, ms; doubles with each further failure. */
  baseDelayMs: number;
  maxDelayMs: number;
  /** Failures within the window that lock the key. */
  lockAfter: number;
  lockMs: number;
  /** Failures older than this are forgotten, ms. */
  windowMs: number;
}

/** Per account: 3 free failures, then 0.5 s, 1 s, 2 s… up to 8 s; 10 failures in 15 min lock it for 15 min. */
export const ACCOUNT_RULE: ThrottleRule = { free: 3, baseDelayMs: 500, maxDelayMs: 8000, lockAfter: 10, lockMs: 15 * 60_000, windowMs: 15 * 60_000 };
/** Per client address (shared offices and camps sit behind one address): 20 free, lock after 100 in 15 min. */
export const ADDRESS_RULE: ThrottleRule = { free: 20, baseDelayMs: 250, maxDelayMs: 4000, lockAfter: 100, lockMs: 15 * 60_000, windowMs: 15 * 60_000 };

interface Entry {
  failures: number[];
  lockedUntil: number;
}

export interface ThrottleVerdict {
  /** Locked: refuse at once (429) with Retry-After. */
  locked: boolean;
  retryAfterMs: number;
  /** Wait this long before checking the password. */
  delayMs: number;
}

export class SignInThrottle {
  private entries = new Map<string, Entry>();
  constructor(private readonly maxKeys = 100_000) {}

  private entry(key: string, now: number, rule: ThrottleRule): Entry {
    let e = this.entries.get(key);
    if (!e) {
      e = { failures: [], lockedUntil: 0 };
      if (this.entries.size >= this.maxKeys) this.entries.delete(this.entries.keys().next().value!);
      this.entries.set(key, e);
    }
    e.failures = e.failures.filter((t) => now - t < rule.windowMs);
    return e;
  }

  /** The verdict for an attempt on these keys (the strictest of them). */
  check(keys: [string, ThrottleRule][], now: number): ThrottleVerdict {
    let delayMs = 0;
    let retryAfterMs = 0;
    for (const [key, rule] of keys) {
      const e = this.entry(key, now, rule);
      if (e.lockedUntil > now) retryAfterMs = Math.max(retryAfterMs, e.lockedUntil - now);
      const paid = e.failures.length - rule.free;
      if (paid >= 0) delayMs = Math.max(delayMs, Math.min(rule.maxDelayMs, rule.baseDelayMs * 2 ** paid));
    }
    return { locked: retryAfterMs > 0, retryAfterMs, delayMs: retryAfterMs > 0 ? 0 : delayMs };
  }

  /** Records a failed attempt on every key; locks a key that reached its limit. */
  fail(keys: [string, ThrottleRule][], now: number): void {
    for (const [key, rule] of keys) {
      const e = this.entry(key, now, rule);
      e.failures.push(now);
      if (e.failures.length >= rule.lockAfter) e.lockedUntil = now + rule.lockMs;
    }
  }

  /** A successful sign-in clears the account's failures (not the address's). */
  succeed(key: string): void {
    this.entries.delete(key);
  }
}

const g = globalThis as unknown as { __lithodexSignInThrottle?: SignInThrottle };
/** The process-wide throttle. */
export const signInThrottle = (): SignInThrottle => (g.__lithodexSignInThrottle ??= new SignInThrottle());
