import { describe, expect, it } from 'vitest';
import { busbarBankTemplate, postToPostTemplate } from '../../../shared/diagram';
import { analyzeDiagram } from '../../../shared/electrical/study';
import { applyTakeoff, optimizeTakeoff, rankLayouts, takeoffVerdict, type RankedLayout } from '../../../shared/electrical/optimizer';

describe('take-off optimizer', () => {
  it('two equal batteries with both leads on battery 1: the best pair is the diagonal, which shares equally', () => {
    const doc = postToPostTemplate({ count: 2, takeOff: 'same-end' });
    const r = optimizeTakeoff(doc);
    if (!r.ok) throw new Error('optimizer failed');
    expect(r.layout).toBe('post_to_post');
    expect(r.options).toHaveLength(4);
    const b = r.best.choice;
    expect(b.kind).toBe('post_to_post');
    if (b.kind !== 'post_to_post') return;
    expect(b.pos.battery).not.toBe(b.neg.battery); // first principles: opposite ends share equally
    expect(r.best.imbalance_pct).toBeLessThan(0.01);
    expect(r.explanation).toMatch(/imbalance from \d+\.\d % to 0\.0 %/);
    // The returned document, analysed afresh, agrees.
    const after = analyzeDiagram(r.document);
    if (!after.ok) throw new Error('analysis failed');
    expect(after.operating!.imbalance_pct).toBeCloseTo(r.best.imbalance_pct, 6);
    expect(after.findings.map((f) => f.id)).not.toContain('both-leads-one-battery');
  });

  it('evaluates every pair on a chain of 4 and ranks by imbalance, then losses, as shown', () => {
    const r = optimizeTakeoff(postToPostTemplate({ count: 4, takeOff: 'same-end' }));
    if (!r.ok) throw new Error('optimizer failed');
    expect(r.options).toHaveLength(16);
    for (let i = 1; i < r.options.length; i++) {
      const a = Math.round(r.options[i - 1].imbalance_pct * 10);
      const b = Math.round(r.options[i].imbalance_pct * 10);
      expect(a <= b).toBe(true);
      // Ties in imbalance as shown are broken by the loss as shown (0.1 W).
      if (a === b) expect(Math.round(r.options[i - 1].losses_W * 10)).toBeLessThanOrEqual(Math.round(r.options[i].losses_W * 10));
    }
    // The options' figures match a fresh analysis of the same layout (candidate leads are truly open).
    const opt = r.options[5];
    const again = analyzeDiagram(applyTakeoff(postToPostTemplate({ count: 4, takeOff: 'same-end' }), opt.choice));
    if (!again.ok) throw new Error('analysis failed');
    expect(again.operating!.imbalance_pct).toBeCloseTo(opt.imbalance_pct, 5);
  });

  it('busbar bank with one long run: equalising the runs to the longest balances it', () => {
    const doc = busbarBankTemplate({ count: 4 });
    doc.cables.find((c) => c.id === 'c-neg2')!.props.length_m = 2;
    const r = optimizeTakeoff(doc);
    if (!r.ok) throw new Error('optimizer failed');
    expect(r.layout).toBe('busbar');
    const now = r.options.find((o) => o.current)!;
    expect(r.best.current).toBe(false);
    expect(r.best.imbalance_pct).toBeLessThan(now.imbalance_pct / 4);
    const c = r.best.choice;
    if (c.kind !== 'cable_lengths') throw new Error('expected lengths');
    expect(Object.keys(c.lengths_m).sort()).toEqual(['c-neg1', 'c-neg3', 'c-neg4']);
    expect(c.lengths_m['c-neg1']).toBeCloseTo(2, 9);
    expect(r.document.cables.find((x) => x.id === 'c-neg3')!.props.length_m).toBeCloseTo(2, 9);
  });
});

/** "from X % to Y %" pairs in a sentence. */
const fromTo = (s: string) => [...s.matchAll(/from (\d+\.\d) % to (\d+\.\d) %/g)].map((m) => [m[1], m[2]]);

describe('take-off verdict: "best" only for a real improvement, and it says why', () => {
  const layout = (description: string, imbalance_pct: number, losses_W: number, current = false, maxCurrent_A = 50): RankedLayout => ({ description, imbalance_pct, losses_W, maxCurrent_A, current });
  const verdict = (xs: RankedLayout[]) => takeoffVerdict([...xs].sort(rankLayouts));

  it('an imbalance lower by less than 0.1 % as shown, at the same loss, is no improvement: the layout as drawn stays best', () => {
    // 4.31 % and 4.27 % both read 4.3 %.
    const v = verdict([layout('as drawn', 4.31, 60.0, true), layout('other', 4.27, 60.02)]);
    expect(v.gain).toBeNull();
    expect(v.best.current).toBe(true);
    expect(v.explanation).toMatch(/^The layout as drawn is already the best of 2 evaluated: imbalance 4\.3 %, losses 60\.0 W\. One other layout does as well, none better\.$/);
  });

  it('the same imbalance as shown with a lower loss: better, and the sentence says the loss decided it', () => {
    const v = verdict([layout('as drawn', 4.34, 67.3, true), layout('positive from Battery 3, negative from Battery 2', 4.26, 65.7)]);
    expect(v.gain).toBe('loss');
    expect(v.best.description).toBe('positive from Battery 3, negative from Battery 2');
    expect(v.explanation).toContain('Positive from Battery 3, negative from Battery 2 gives the same imbalance as the layout as drawn, 4.3 %, with lower losses: 65.7 W instead of 67.3 W');
    expect(v.explanation).toContain('the loss decided it');
    expect(fromTo(v.explanation)).toEqual([]);
  });

  it('an imbalance lower by 0.1 % or more as shown: better by imbalance, with the loss change stated', () => {
    const v = verdict([layout('as drawn', 12.8, 67.3, true, 45.2), layout('diagonal', 2.2, 65.7, false, 42.5), layout('worse', 20, 70)]);
    expect(v.gain).toBe('imbalance');
    expect(v.explanation).toBe('Diagonal brings the imbalance from 12.8 % to 2.2 % and the losses from 67.3 W to 65.7 W; the busiest battery carries 42.5 A instead of 45.2 A (best of 3 layouts evaluated).');
  });

  it('two layouts reach the best imbalance: the lower loss wins, and the sentence says so', () => {
    const v = verdict([layout('as drawn', 9.0, 50, true), layout('first', 1.0, 52), layout('second', 1.04, 51)]);
    expect(v.best.description).toBe('second');
    expect(v.explanation).toContain('2 layouts reach 1.0 %, and the loss decided between them');
  });

  it('equal loss as shown is no tie-break: the layout as drawn stays best', () => {
    const v = verdict([layout('as drawn', 3.0, 41.31, true), layout('other', 3.0, 41.27)]);
    expect(v.gain).toBeNull();
  });

  it('never writes "from X % to X %", whatever the figures', () => {
    // A fixed pseudo-random sweep of layouts near one another (figures within a few tenths).
    let seed = 12345;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    for (let run = 0; run < 500; run++) {
      const xs = Array.from({ length: 2 + Math.floor(rnd() * 6) }, (_, i) => layout(`layout ${i}`, 4 + rnd() * 0.4, 60 + rnd() * 0.4, i === 0, 40 + rnd()));
      const v = verdict(xs);
      for (const [a, b] of fromTo(v.explanation)) expect(a, v.explanation).not.toBe(b);
      if (v.gain === 'loss') expect(v.explanation).toContain('the loss decided it');
      if (v.gain === null) expect(v.explanation).toMatch(/^The layout as drawn is already the best/);
      else expect(v.best.current).toBe(false);
    }
  });
});

describe('take-off optimizer on drawn banks', () => {
  it('two equal batteries with a diagonal take-off are already balanced: no "best" other than the layout as drawn', () => {
    // First principles: with opposite-end leads both batteries see the same path resistance, so they share equally.
    const r = optimizeTakeoff(postToPostTemplate({ count: 2, takeOff: 'diagonal' }));
    if (!r.ok) throw new Error('optimizer failed');
    expect(r.gain).toBeNull();
    expect(r.best.current).toBe(true);
    expect(r.explanation).toMatch(/^The layout as drawn is already the best of 4 evaluated: imbalance 0\.0 %/);
    // The other diagonal is its mirror image: as good, not better (first principles: symmetry).
    expect(r.explanation).toContain('One other layout does as well, none better.');
  });

  it('four batteries with a diagonal take-off: any "best" is a real improvement, and the sentence says what decided it', () => {
    const r = optimizeTakeoff(postToPostTemplate({ count: 4, takeOff: 'diagonal' }));
    if (!r.ok) throw new Error('optimizer failed');
    for (const [a, b] of fromTo(r.explanation)) expect(a).not.toBe(b);
    const now = r.options.find((o) => o.current)!;
    if (r.gain === 'loss') {
      expect(r.explanation).toContain('the loss decided it');
      expect(Math.round(r.best.losses_W * 10)).toBeLessThan(Math.round(now.losses_W * 10));
    } else if (r.gain === 'imbalance') {
      expect(Math.round(r.best.imbalance_pct * 10)).toBeLessThan(Math.round(now.imbalance_pct * 10));
    } else {
      expect(r.best).toBe(now);
      expect(r.document).toEqual(postToPostTemplate({ count: 4, takeOff: 'diagonal' }));
    }
  });
});
