import { describe, expect, it } from 'vitest';
import { createSignInLimiter } from '../../../server/auth/rate-limit';

function clock(start = 1_000_000) {
  let now = start;
  return { now: () => now, advance: (ms: number) => (now += ms) };
}

describe('sign-in limiter', () => {
  it('locks an account after 5 failures for 30 s, then doubles the lock with each further failure', () => {
    const c = clock();
    const l = createSignInLimiter({ now: c.now });
    for (let i = 0; i < 4; i++) l.recordFailure('a@x.test', '10.0.0.1');
    expect(l.retryAfterSeconds('a@x.test', '10.0.0.1')).toBe(0);
    l.recordFailure('a@x.test', '10.0.0.1');
    expect(l.retryAfterSeconds('a@x.test', '10.0.0.9')).toBe(30);
    c.advance(30_000);
    expect(l.retryAfterSeconds('a@x.test', '10.0.0.9')).toBe(0);
    l.recordFailure('a@x.test', '10.0.0.1');
    expect(l.retryAfterSeconds('a@x.test', '10.0.0.9')).toBe(60);
    c.advance(60_000);
    l.recordFailure('a@x.test', '10.0.0.1');
    expect(l.retryAfterSeconds('a@x.test', '10.0.0.9')).toBe(120);
  });

  it('caps the lock at 15 minutes', () => {
    const c = clock();
    const l = createSignInLimiter({ now: c.now });
    for (let i = 0; i < 30; i++) l.recordFailure('a@x.test', `10.0.0.${i}`);
    expect(l.retryAfterSeconds('a@x.test', '10.0.1.1')).toBe(900);
  });

  it('treats e-mails case-insensitively and forgets failures after 15 quiet minutes', () => {
    const c = clock();
    const l = createSignInLimiter({ now: c.now });
    for (let i = 0; i < 4; i++) l.recordFailure('A@X.test', '10.0.0.1');
    c.advance(15 * 60_000);
    l.recordFailure('a@x.test', '10.0.0.1');
    expect(l.retryAfterSeconds('a@x.test', '10.0.0.1')).toBe(0);
  });

  it('a success clears the account count but not the IP count', () => {
    const c = clock();
    const l = createSignInLimiter({ now: c.now, ipMaxFailures: 6 });
    for (let i = 0; i < 4; i++) l.recordFailure('a@x.test', '10.0.0.1');
    l.recordSuccess('a@x.test');
    l.recordFailure('a@x.test', '10.0.0.1');
    expect(l.retryAfterSeconds('a@x.test', '10.0.0.2')).toBe(0);
    l.recordFailure('b@x.test', '10.0.0.1');
    expect(l.retryAfterSeconds('c@x.test', '10.0.0.1')).toBe(30);
  });
});
