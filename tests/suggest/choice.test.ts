import { describe, expect, it } from 'vitest';
import { choiceLoss, fitChoice, type ChoiceData } from '../../src/suggest/choice.js';
import { fitGrouped } from '../../src/suggest/logistic.js';
import { seededRandom as rng } from '../../src/math/random.js';


/** Sets of three themes (0, 1, 2) plus "none", one row per theme, with given chosen theme (-1 = none). */
function threeWay(choices: number[], feature?: (s: number, t: number) => number, partial?: number[]): ChoiceData {
  const n = choices.length + (partial?.length ?? 0);
  const x = new Float64Array(n * 3 * (feature ? 1 : 0));
  const theme = new Int32Array(n * 3);
  const y = new Uint8Array(n * 3);
  const setStart = Int32Array.from({ length: n + 1 }, (_, s) => 3 * s);
  const part = new Uint8Array(n);
  for (let s = 0; s < n; s++) {
    for (let t = 0; t < 3; t++) {
      theme[3 * s + t] = t;
      if (feature) x[3 * s + t] = feature(s, t);
      if (s < choices.length) y[3 * s + t] = choices[s] === t ? 1 : 0;
      else y[3 * s + t] = partial![s - choices.length] === t ? 1 : 0;
    }
    part[s] = s < choices.length ? 0 : 1;
  }
  return { x, k: feature ? 1 : 0, theme, y, setStart, partial: part, themes: 3 };
}

describe('conditional logit with a "none" alternative', () => {
  it('with constants only, reproduces the observed shares (the MLE of alternative-specific constants)', () => {
    // Reference: Train, Discrete Choice Methods with Simulation (2nd ed., 2009), section 3.7.1:
    // with a full set of alternative-specific constants, predicted shares equal sample shares.
    const choices = [...Array(30).fill(0), ...Array(15).fill(1), ...Array(5).fill(2), ...Array(50).fill(-1)];
    const m = fitChoice(threeWay(choices), 0, 1e-9);
    const denom = 1 + m.intercepts.reduce((a, b) => a + Math.exp(b), 0);
    [0.3, 0.15, 0.05].forEach((share, t) => expect(Math.exp(m.intercepts[t]!) / denom).toBeCloseTo(share, 6));
    expect(m.intercepts[0]).toBeCloseTo(Math.log(30 / 50), 6);
  });

  it('with one theme per set, is the binary logistic regression of that theme against none', () => {
    const r = rng(3);
    const n = 400;
    const xs = Float64Array.from({ length: n }, () => r() * 4 - 2);
    const group = Int32Array.from({ length: n }, (_, i) => i % 2);
    const ys = Uint8Array.from(xs, (v, i) => (r() < 1 / (1 + Math.exp(-(1.3 * v + (i % 2 ? 0.5 : -0.4)))) ? 1 : 0));
    const d: ChoiceData = { x: xs, k: 1, theme: group, y: ys, setStart: Int32Array.from({ length: n + 1 }, (_, i) => i), themes: 2 };
    const a = fitChoice(d, 0.5, 1e-3);
    const b = fitGrouped({ x: xs, k: 1, y: ys, group, groups: 2 }, 0.5, 1e-3);
    expect(a.weights[0]).toBeCloseTo(b.weights[0]!, 6);
    a.intercepts.forEach((v, t) => expect(v).toBeCloseTo(b.intercepts[t]!, 6));
  });

  it('recovers a shared weight from simulated choices', () => {
    const r = rng(7);
    const w = 1.5;
    const b = [0.2, -0.3, 0.1];
    const feats: number[][] = [];
    const choices: number[] = [];
    for (let s = 0; s < 3000; s++) {
      const f = [r() * 2 - 1, r() * 2 - 1, r() * 2 - 1];
      const e = f.map((v, t) => Math.exp(w * v + b[t]!));
      const u = r() * (1 + e.reduce((p, q) => p + q, 0));
      let c = -1;
      let acc = 1;
      if (u >= acc) for (let t = 0; t < 3 && c < 0; t++) if (u < (acc += e[t]!)) c = t;
      feats.push(f);
      choices.push(c);
    }
    const m = fitChoice(threeWay(choices, (s, t) => feats[s]![t]!), 1e-6, 1e-6);
    expect(m.weights[0]).toBeGreaterThan(1.3);
    expect(m.weights[0]).toBeLessThan(1.7);
    m.intercepts.forEach((v, t) => expect(Math.abs(v - b[t]!)).toBeLessThan(0.15));
  });

  it('treats a rejection as "not this theme": the fit is a stationary point of the likelihood', () => {
    // 20 passages coded 0, 10 coded 1, 30 none, and 20 where only "not 0" is known.
    const choices = [...Array(20).fill(0), ...Array(10).fill(1), ...Array(30).fill(-1)];
    const d = threeWay(choices, undefined, Array(20).fill(0));
    const m = fitChoice(d, 0, 1e-9);
    const draws = 20 + 10 + 30 + 20;
    const objective = (b: number[]) => choiceLoss({ weights: [], intercepts: b }, d) * draws;
    for (let t = 0; t < 3; t++) {
      const h = 1e-5;
      const up = m.intercepts.slice();
      const down = m.intercepts.slice();
      up[t] = up[t]! + h;
      down[t] = down[t]! - h;
      expect((objective(up) - objective(down)) / (2 * h)).toBeCloseTo(0, 4);
    }
    // Rejections of theme 0 lower its share below the 20 / 60 it has among the fully coded sets.
    const denom = 1 + m.intercepts.reduce((a, b) => a + Math.exp(b), 0);
    expect(Math.exp(m.intercepts[0]!) / denom).toBeLessThan(20 / 60);
  });
});
