/**
 * `modvet demo`: a short tour of the numeric layer, each value computed to the requested
 * digits, with the closed form it should equal beside it (so a reader can check by eye).
 */
import { Decimal } from 'decimal.js';
import { Complex } from '../numeric/complex.js';
import { euler, ln2, pi } from '../numeric/constants.js';
import { withDigits } from '../numeric/precision.js';
import { gamma } from '../special/gamma.js';
import { zeta } from '../special/zeta.js';
import { dirichletBeta } from '../special/dirichletBeta.js';
import { besselK } from '../special/besselK.js';
import { eisensteinE } from '../modular/eisenstein.js';
import { eta } from '../modular/eta.js';
import { kleinJ } from '../modular/kleinJ.js';
import { nonholomorphicE } from '../modular/nonholomorphic.js';

export function demoLines(d: number): string[] {
  return withDigits(d, () => {
    const show = (z: Complex) => (z.im.isZero() ? z.re.toString() : z.toString());
    const rows: [string, string, string][] = [
      ['pi', pi().toString(), ''],
      ['log 2', ln2().toString(), ''],
      ['Euler gamma', euler().toString(), ''],
      ['exp(pi sqrt(163))', show(Complex.of(163).sqrt().scale(pi()).exp()), 'nearly an integer'],
      ['zeta(3)', show(zeta(Complex.of(3))), "Apery's constant"],
      ['beta(2)', show(dirichletBeta(Complex.of(2))), "Catalan's constant"],
      ['Gamma(1/4)', show(gamma(Complex.of('0.25'))), ''],
      ['K_0(1)', show(besselK(Complex.ZERO, new Decimal(1))), ''],
      ['E_4(i)', show(eisensteinE(4, Complex.I)), '= 3 Gamma(1/4)^8 / (2 pi)^6'],
      ['eta(i)', show(eta(Complex.I)), '= Gamma(1/4) / (2 pi^(3/4))'],
      ['j(i)', show(kleinJ(Complex.I)), '= 1728'],
      ['E(2, i)', show(nonholomorphicE(Complex.of(2), Complex.I)), '= 30 beta(2) / pi^2 (coset normalisation)'],
    ];
    const w = Math.max(...rows.map((r) => r[0].length));
    return [
      `modvet numeric layer, ${d} significant digits:`,
      ...rows.map(([k, v, note]) => `  ${k.padEnd(w)}  ${v}${note === '' ? '' : `   (${note})`}`),
    ];
  });
}
