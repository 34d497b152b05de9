// The HTML report (`modvet check --report FILE`; src/report/html.ts, src/report/claimPlot.ts):
// the built CLI (dist/, built by `pretest`) writes the page for a fixture folder of four
// claims (one that holds, one refuted with a diagnosis, one with a group clause, one at a
// fixed point); Debian's Chromium, driven by playwright-core, loads it from its file://
// URL: no console or page errors, no request but the page itself, one table row per claim,
// an <svg> in every claim section, and a screenshot. Also: the page is the same for 1 and
// 2 worker threads (times aside), a .vet or unwritable --report path, and which claims get
// a path plot (decided from the AST).
//
// The browser test is skipped, with a message, only when /usr/bin/chromium is absent and
// MODVET_REQUIRE_CHROMIUM is unset; with it set (CI), a missing Chromium fails the test.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import { parseSource } from '../../src/lang/parser.js';
import { evaluationCost, PATH_BUDGET } from '../../src/report/claimPlot.js';
import { htmlDocument, type HtmlClaim } from '../../src/report/html.js';

const BIN = fileURLToPath(new URL('../../dist/src/cli/main.js', import.meta.url));
const CHROMIUM = '/usr/bin/chromium';
const HAVE_CHROMIUM = existsSync(CHROMIUM);
const REQUIRED = process.env.MODVET_REQUIRE_CHROMIUM !== undefined && process.env.MODVET_REQUIRE_CHROMIUM !== '';
if (!HAVE_CHROMIUM && !REQUIRED) {
  console.warn(
    `test/report/html.test.ts: ${CHROMIUM} not found, the browser test is skipped ` +
      '(apt-get install -y chromium chromium-driver; set MODVET_REQUIRE_CHROMIUM=1 to make this an error)',
  );
}

const FIXTURE = `# fixtures for the HTML report
claim "E4 squared is E8"
  source "Serre, A Course in Arithmetic, ch. VII, 3.2"
  E(4, tau)^2 = E(8, tau)

claim "a lost factor 2 <&>"
  expect refuted
  E(4, tau)^2 = 2*E(8, tau)

claim "weight-12 law of Delta"
  for g in SL2Z
  Delta(g(tau)) = (c*tau + d)^12 * Delta(tau)

claim "E6 vanishes at i"
  at tau in {i}
  E(6, tau) = 0
`;
const NAMES = ['E4 squared is E8', 'a lost factor 2 <&>', 'weight-12 law of Delta', 'E6 vanishes at i'];

let dir = '';

function modvet(...args: string[]): { code: number; out: string; err: string } {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd: dir, encoding: 'utf8', env: { ...process.env, NO_COLOR: '1' }, timeout: 110000 });
  return { code: r.status ?? -1, out: r.stdout, err: r.stderr };
}

/** The page without the times (the only part that may differ between runs). */
function withoutTimes(html: string): string {
  return html.replace(/\d+\.\d\d s\b/g, 'T s');
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'modvet-html-'));
  mkdirSync(join(dir, 'claims'));
  writeFileSync(join(dir, 'claims', 'fixture.vet'), FIXTURE);
  const r = modvet('check', 'claims', '--samples', '6', '--jobs', '1', '--report', 'report.html');
  if (r.code !== 0) throw new Error(`modvet check --report failed (exit ${r.code}):\n${r.out}\n${r.err}`);
}, 120000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('modvet check --report', () => {
  it('writes one self-contained page: summary, a row and a section per claim, no scripts or outside links', () => {
    const html = readFileSync(join(dir, 'report.html'), 'utf8');
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html).toContain('Numerical agreement is evidence, not proof.');
    expect(html).toContain('<dt>seed</dt><dd>1</dd>');
    expect(html).toContain('<dt>samples</dt><dd>6</dd>');
    expect(html).toContain('<dt>modvet</dt><dd>0.1.0</dd>');
    expect(html).not.toMatch(/<script|<link rel="stylesheet"|@import|url\((?!#)/i);
    // the only address outside the page is the SVG namespace, which is never fetched
    expect(html.match(/https?:\/\/[^"'\s<]+/g)?.filter((u) => u !== 'http://www.w3.org/2000/svg') ?? []).toEqual([]);
    expect(html.match(/<tr id="row-\d+"/g)).toHaveLength(4);
    expect(html.match(/<section class="claim[^"]*" id="claim-\d+">/g)).toHaveLength(4);
    expect(html).toContain('a lost factor 2 &lt;&amp;&gt;');
    expect(html).toContain('Diagnosis:');
    expect(html).toContain('no path plot: the claim is checked at fixed points only');
    expect(html).toMatch(/held fixed \(as at the worst sample\): g = \(/);
  });
  it('is the same page for 1 and 2 worker threads, times aside', () => {
    const r = modvet('check', 'claims', '--samples', '6', '--jobs', '2', '--report', 'again.html');
    expect(r.code).toBe(0);
    expect(withoutTimes(readFileSync(join(dir, 'again.html'), 'utf8'))).toBe(withoutTimes(readFileSync(join(dir, 'report.html'), 'utf8')));
  }, 120000);
  it('refuses a .vet path, and an unwritable path is a message and exit code 2', () => {
    const vet = modvet('check', 'claims', '--samples', '2', '--report', 'claims/fixture.vet');
    expect(vet.code).toBe(2);
    expect(vet.err).toContain('--report');
    expect(readFileSync(join(dir, 'claims', 'fixture.vet'), 'utf8')).toBe(FIXTURE);
    const bad = modvet('check', 'claims', '--samples', '2', '--only', 'E6', '--report', 'nowhere/report.html');
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/cannot write the HTML report nowhere\/report\.html/);
    expect(bad.err).not.toMatch(/at .*\.js:\d+/); // no stack trace
  }, 120000);
});

describe('what gets a path plot', () => {
  const costOf = (...lines: string[]) => {
    const { ast, diagnostics } = parseSource(`claim "c"\n${lines.map((l) => `  ${l}\n`).join('')}`, 't.vet');
    expect(diagnostics).toEqual([]);
    return evaluationCost(ast.claims[0]!);
  };
  it('is decided from the AST: lattice sums and costly operands are skipped, q-series are not', () => {
    expect(costOf('sum((m, n) != (0, 0), 1/(m*tau + n)^4) = 2*zeta(4)*E(4, tau)')).toBe(Infinity);
    expect(costOf('for s in [1.2, 3]', 'lap(Ens(s, tau)) = s*(s - 1)*Ens(s, tau)')).toBeGreaterThan(PATH_BUDGET);
    expect(costOf('E(4, tau)^2 = E(8, tau)')).toBeLessThanOrEqual(PATH_BUDGET);
    expect(costOf('1 + 240*sum(n = 1..inf, sigma(3, n)*q^n) = E(4, tau)')).toBeLessThanOrEqual(PATH_BUDGET);
  });
});

describe('htmlDocument', () => {
  const claim: HtmlClaim = {
    name: 'x <y> & "z"',
    file: 'a.vet',
    line: 3,
    equation: 'f(tau) = g(tau) </code><script>',
    verdict: 'holds',
    expect: 'holds',
    ok: true,
    digits: 30,
    requested: 30,
    vanishing: false,
    samples: 1,
    timeMs: 12,
    pathNote: 'path plot skipped: costly claim (a lattice sum)',
    sampleRows: [],
  };
  it('escapes names and equations, and links each row to its section', () => {
    const page = htmlDocument({ version: '0.1.0', settings: { seed: 1, digits: 30, samples: 1, yMin: 0.02 }, claims: [claim], problems: [] });
    expect(page).not.toContain('<script>');
    expect(page).toContain('x &lt;y&gt; &amp; &quot;z&quot;');
    expect(page).toContain('<a href="#claim-1">');
    expect(page).toContain('id="claim-1"');
    expect(page).toContain('path plot skipped: costly claim');
  });
});

describe.skipIf(!HAVE_CHROMIUM && !REQUIRED)('the report in Chromium', () => {
  it('loads from file:// with no errors and no requests, a row per claim, an <svg> per claim, and a screenshot', async () => {
    expect(HAVE_CHROMIUM, `MODVET_REQUIRE_CHROMIUM is set but ${CHROMIUM} is absent (apt-get install -y chromium chromium-driver)`).toBe(true);
    const browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    try {
      const page = await browser.newPage({ viewport: { width: 1200, height: 900 } });
      const problems: string[] = [];
      const requests: string[] = [];
      page.on('console', (m) => {
        if (m.type() === 'error' || m.type() === 'warning') problems.push(`console ${m.type()}: ${m.text()}`);
      });
      page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
      page.on('request', (r) => requests.push(r.url()));
      const url = pathToFileURL(join(dir, 'report.html')).href;
      await page.goto(url, { waitUntil: 'load' });

      expect(await page.title()).toContain('modvet check report');
      const rows = page.locator('table.claims tbody tr');
      expect(await rows.count()).toBe(NAMES.length);
      expect(await rows.locator('td:nth-child(7)').allTextContents()).toEqual(NAMES);
      const sections = page.locator('section.claim');
      expect(await sections.count()).toBe(NAMES.length);
      for (let k = 0; k < NAMES.length; k++) {
        const s = sections.nth(k);
        expect(await s.getAttribute('id')).toBe(`claim-${k + 1}`);
        expect(await s.locator('svg').count(), `claim ${k + 1} has no plot`).toBeGreaterThan(0);
        // the plots are laid out, not collapsed
        const box = await s.locator('svg').first().boundingBox();
        expect(box !== null && box.width > 200 && box.height > 100).toBe(true);
      }
      // fixed point: the residual panel only; the others also the path
      expect(await sections.nth(3).locator('svg').count()).toBe(1);
      for (let k = 0; k < 3; k++) expect(await sections.nth(k).locator('svg').count()).toBe(2);
      expect(await sections.nth(1).locator('.explain').textContent()).toMatch(/Diagnosis:.*Simplest failure:.*Suggested:/s);

      // a row's link goes to its section
      await rows.nth(2).locator('a').click();
      expect(new URL(page.url()).hash).toBe('#claim-3');

      const shot = join(dir, 'report.png');
      await page.screenshot({ path: shot, fullPage: true });
      const png = readFileSync(shot);
      expect(png.length).toBeGreaterThan(10000);
      expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

      expect(problems).toEqual([]);
      expect(requests).toEqual([url]);
    } finally {
      await browser.close();
    }
  }, 120000);
});
