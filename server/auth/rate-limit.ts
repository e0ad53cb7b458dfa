/**
 * Failed sign-in attempts counted per account and per address over a sliding window. In memory:
 * one server process per data dir (the data-dir lock sees to that), and a restart forgetting a
 * few failures costs an attacker nothing they could not get by waiting.
 */
export interface RateLimitRule {
  max: number;
  windowMs: number;
}

/** Per account 5 failures in 15 min, per address 20: a person mistyping never meets it. */
export const SIGN_IN_LIMITS = {
  account: { max: 5, windowMs: 15 * 60_000 },
  address: { max: 20, windowMs: 15 * 60_000 },
} as const satisfies Record<string, RateLimitRule>;

export class FailureCounter {
  private readonly failures = new Map<string, number[]>();

  constructor(private readonly rule: RateLimitRule) {}

  private recent(key: string, now: number): number[] {
    const kept = (this.failures.get(key) ?? []).filter((at) => now - at < this.rule.windowMs);
    if (kept.length === 0) this.failures.delete(key);
    else this.failures.set(key, kept);
    return kept;
  }

  /** Seconds until another attempt is allowed, or 0 when it is allowed now. */
  retryAfterSeconds(key: string, now: number): number {
    const recent = this.recent(key, now);
    if (recent.length < this.rule.max) return 0;
    return Math.ceil((recent[recent.length - this.rule.max]! + this.rule.windowMs - now) / 1000);
  }

  fail(key: string, now: number): void {
    this.failures.set(key, [...this.recent(key, now), now]);
  }

  clear(key: string): void {
    this.failures.delete(key);
  }
}
