/**
 * Drawing the samples of a claim from the run's seed.
 *
 * Policy (the default of 16 samples): half the points tau in the fundamental domain F, half
 * images tau = gamma0 tau0 (gamma0 random in SL(2,Z)) with Im tau >= 4 yMin, so the series
 * are exercised near the real axis too. A claim with a group clause also draws its own
 * element gamma per sample with Im(gamma tau) >= yMin. Parameters: a fresh random value
 * per sample for intervals and boxes; every listed value for value lists (the whole sample
 * set is repeated for each combination). A region restricts tau by rejection.
 * Each claim gets its own stream, forked from the seed by the claim's file and name, so
 * adding a claim does not move the samples of the others.
 */
import { Complex } from '../numeric/complex.js';
import { ModvetError } from '../numeric/errors.js';
import { Random } from '../numeric/random.js';
import { makeGroup } from '../groups/subgroups.js';
import { randomElement, randomInFundamental } from '../groups/sample.js';
import { CheckableClaim, ParamSpec, Sample } from './claim.js';

export interface SamplingOptions {
  seed: number;
  samples: number;
  yMin: number;
}

const REGION_ATTEMPTS = 2000;
const SL2Z = makeGroup('SL2Z');

function short(x: number): string {
  return x.toPrecision(15);
}

function drawParam(p: ParamSpec, rng: Random): Complex | null {
  switch (p.kind) {
    case 'interval':
      return Complex.of(short(rng.uniform(p.lo, p.hi)));
    case 'box':
      return Complex.of(short(rng.uniform(p.reLo, p.reHi)), short(rng.uniform(p.imLo, p.imHi)));
    case 'values':
      return null;
  }
}

/** Every combination of the listed parameter values (one empty combination if none). */
function listCombinations(params: ParamSpec[]): Map<string, Complex>[] {
  let combos: Map<string, Complex>[] = [new Map()];
  for (const p of params) {
    if (p.kind !== 'values') continue;
    const next: Map<string, Complex>[] = [];
    for (const c of combos) {
      for (const v of p.values) next.push(new Map(c).set(p.name, v));
    }
    combos = next;
  }
  return combos;
}

function drawTau(rng: Random, image: boolean, yMin: number, region?: (t: Complex) => boolean): Complex {
  for (let i = 0; i < REGION_ATTEMPTS; i++) {
    // with a region, both kinds of point are tried: the region may exclude F or the strip
    const asImage = region === undefined ? image : i % 2 === (image ? 0 : 1);
    let tau = randomInFundamental(rng);
    if (asImage) {
      const g = randomElement(SL2Z, rng, tau, { yMin: 4 * yMin });
      tau = g.act(tau);
      // translate into |x| <= 1/2: the height is what matters, and images like -1/tau
      // stay inside the sampled strip
      const shift = tau.re.round();
      tau = Complex.of(tau.re.minus(shift).toSD(15), tau.im.toSD(15));
    }
    if (region === undefined || region(tau)) return tau;
  }
  throw new ModvetError('domain', 'sample', `no point found in the claim's region after ${REGION_ATTEMPTS} draws`);
}

/**
 * The samples of a claim, deterministic in (seed, file, name, salt). A non-empty salt gives
 * an independent set, from which the checker takes replacements for unusable samples.
 */
export function drawSamples(claim: CheckableClaim, opts: SamplingOptions, salt = ''): Sample[] {
  const rng = new Random(claim.seed ?? opts.seed).fork(`${claim.file}\u0000${claim.name}${salt === '' ? '' : `\u0000${salt}`}`);
  const n = claim.samples ?? opts.samples;
  const yMin = claim.yMin ?? opts.yMin;
  const out: Sample[] = [];
  for (const combo of listCombinations(claim.params)) {
    const points: { tau: Complex; origin: Sample['origin'] }[] = [];
    if (claim.points !== undefined) {
      for (const tau of claim.points) points.push({ tau, origin: 'fixed' });
    } else {
      for (let k = 0; k < n; k++) {
        const image = k >= Math.ceil(n / 2);
        points.push({ tau: drawTau(rng, image, yMin, claim.region), origin: image ? 'image' : 'F' });
      }
    }
    for (const p of points) {
      const params = new Map(combo);
      for (const spec of claim.params) {
        const v = drawParam(spec, rng);
        if (v !== null) params.set(spec.name, v);
      }
      const sample: Sample = { tau: p.tau, params, origin: p.origin };
      if (claim.group !== undefined) {
        if (p.tau.im.lt(yMin)) {
          throw new ModvetError('domain', 'sample', `Im tau = ${p.tau.im} is below y_min = ${yMin}`);
        }
        sample.gamma = randomElement(claim.group.group, rng, p.tau, { yMin });
      }
      out.push(sample);
    }
  }
  return out;
}
