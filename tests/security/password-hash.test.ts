/**
 * ASVS 5.0 11.4.2 + Appendix C: a password hash must cost 50–250 ms
 * so guessing is slow but sign-in is not. tests/api/auth.test.ts checks the bcrypt cost factor;
 * this measures what that factor costs on the machine running the tests. The lower bound is
 * asserted (strength); the upper one is printed, since a shared CPU only ever makes it slower.
 */
import bcrypt from 'bcryptjs';
import { describe, expect, it } from 'vitest';
import { BCRYPT_COST } from '../../api/src/modules/auth/auth.service.ts';

describe('password hashing cost', () => {
  it('when a password is checked at the configured cost, then it takes at least 50 ms', async () => {
    const hash = await bcrypt.hash('correct horse battery staple', BCRYPT_COST);
    const times: number[] = [];
    for (let i = 0; i < 3; i += 1) {
      const t = performance.now();
      expect(await bcrypt.compare('correct horse battery staple', hash)).toBe(true);
      times.push(performance.now() - t);
    }
    const median = times.sort((a, b) => a - b)[1];
    console.log(`bcrypt cost ${BCRYPT_COST}: compare median ${median.toFixed(0)} ms (target 50–250 ms: ${median <= 250 ? 'met' : 'above on this machine now'})`);
    expect(median).toBeGreaterThanOrEqual(50);
  }, 30_000);
});
