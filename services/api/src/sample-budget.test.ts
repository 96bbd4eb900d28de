import { describe, expect, it } from 'vitest';
import { ProblemError } from './problems.js';
import { SampleBudget } from './sample-budget.js';

function statusOf(f: () => unknown): number | null {
  try {
    f();
    return null;
  } catch (err) {
    return err instanceof ProblemError ? err.status : -1;
  }
}

describe('SampleBudget', () => {
  it('admits recordings until the budget is spent, then answers 503 until one is released', () => {
    const budget = new SampleBudget(10_000_000);
    const a = budget.admit(4_000_000);
    const b = budget.admit(4_000_000);
    expect(statusOf(() => budget.admit(4_000_000))).toBe(503);
    a();
    a(); // a second release gives nothing back twice
    expect(budget.samplesInFlight).toBe(4_000_000);
    const c = budget.admit(4_000_000);
    b();
    c();
    expect(budget.samplesInFlight).toBe(0);
  });

  it('answers 413 for a recording larger than the whole budget, which waiting cannot help', () => {
    expect(statusOf(() => new SampleBudget(1000).admit(1001))).toBe(413);
  });

  it('tells the client when to retry', () => {
    const budget = new SampleBudget(10);
    budget.admit(10);
    try {
      budget.admit(1);
    } catch (err) {
      expect((err as ProblemError).extras.headers?.['retry-after']).toMatch(/^\d+$/);
    }
  });
});
