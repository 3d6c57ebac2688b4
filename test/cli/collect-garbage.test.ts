// The collection a large run makes between screening and writing: it runs only from
// COLLECT_FROM_STATIONS stations, and it really collects (an object only a WeakRef points to is gone).
import { describe, expect, it } from 'vitest';
import { collectBetweenStages, COLLECT_FROM_STATIONS } from '../../src/cli/collect-garbage.js';

describe('the collection between stages', () => {
  it('is skipped for a small run', () => {
    expect(collectBetweenStages(COLLECT_FROM_STATIONS - 1)).toBe(false);
  });

  it('collects what nothing holds in a large run', async () => {
    let ref: WeakRef<object> | null = null;
    (() => {
      ref = new WeakRef({ payload: new Array(1000).fill(1) });
    })();
    // a WeakRef's target lives to the end of the job that made it [from memory: ECMAScript WeakRef, KeepDuringJob]
    await new Promise((resolve) => setTimeout(resolve, 0));
    expect(collectBetweenStages(COLLECT_FROM_STATIONS)).toBe(true);
    expect(ref!.deref()).toBeUndefined();
  });
});
