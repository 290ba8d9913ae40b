/**
 * Counts failed sign-ins per account and per address in a sliding window (ASVS 6.1.1, 6.3.1).
 * In-memory per API process: a multi-node deployment shares the account lockout only per node,
 * which the README states.
 */
export class LoginThrottle {
  private failures = new Map<string, number[]>();

  constructor(
    private readonly maxPerAccount = 5,
    private readonly maxPerAddress = 20,
    private readonly windowMs = 15 * 60_000,
  ) {}

  /** Seconds until the next attempt is allowed, or 0. */
  retryAfterS(email: string, ip: string, now = Date.now()): number {
    const a = this.waitFor(`a:${email}`, this.maxPerAccount, now);
    const b = this.waitFor(`i:${ip}`, this.maxPerAddress, now);
    return Math.ceil(Math.max(a, b) / 1000);
  }

  fail(email: string, ip: string, now = Date.now()): void {
    for (const key of [`a:${email}`, `i:${ip}`]) {
      const list = this.recent(key, now);
      list.push(now);
      this.failures.set(key, list);
    }
  }

  succeed(email: string): void {
    this.failures.delete(`a:${email}`);
  }

  private recent(key: string, now: number): number[] {
    return (this.failures.get(key) ?? []).filter((t) => now - t < this.windowMs);
  }

  private waitFor(key: string, max: number, now: number): number {
    const list = this.recent(key, now);
    if (list.length < max) return 0;
    return list[list.length - max] + this.windowMs - now;
  }
}
