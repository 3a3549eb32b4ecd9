/**
 * The report as one self-contained HTML document (styles and figures inline, system fonts, no scripts,
 * no links to anything): title block, deciding settings, figures, tables, Vs30 and site class (or the
 * set-up problems that block them), notes on the data, method notes and cautions. Printed by a browser
 * to PDF; @page sets the paper (A4 or US Letter) and figures keep their captions on the same page.
 */
import { unitSpec, type UnitSystem } from '../units';
import type { ReportData } from './data';
import { digitRule, reportedText, ruleWords, type ReportedQuantity } from './digits';
import { reportFigures, type Figure } from './figures';
import { esc, FONT_STACK } from './svg';

export type Paper = 'A4' | 'Letter';

export interface ReportOptions {
  paper?: Paper;
}

const PAGE_SIZE: Record<Paper, string> = { A4: 'A4 portrait', Letter: 'letter portrait' };

function css(paper: Paper): string {
  return `
@page { size: ${PAGE_SIZE[paper]}; margin: 14mm 14mm 16mm 14mm; }
:root { color: #1f2933; background: #fff; }
* { box-sizing: border-box; }
body { font-family: ${FONT_STACK}; font-size: 9.5pt; line-height: 1.35; margin: 0 auto; max-width: 188mm; padding: 6mm 0; }
@media print { body { max-width: none; padding: 0; } }
h1 { font-size: 17pt; margin: 0 0 1mm; }
h2 { font-size: 12.5pt; margin: 6mm 0 2mm; border-bottom: 1.5px solid #0f766e; padding-bottom: 1mm; break-after: avoid; page-break-after: avoid; }
h3 { font-size: 10.5pt; margin: 4mm 0 1.5mm; break-after: avoid; page-break-after: avoid; }
p { margin: 1.2mm 0; }
.subtitle { font-size: 10.5pt; margin: 0 0 3mm; }
.caution-box { border: 1.5px solid #1f2933; padding: 2mm 3mm; margin: 3mm 0; font-weight: 600; break-inside: avoid; }
table { border-collapse: collapse; width: 100%; margin: 1.5mm 0 3mm; font-variant-numeric: tabular-nums; }
th, td { border-bottom: 0.5px solid #9aa5b1; padding: 0.7mm 1.4mm; vertical-align: top; }
th { text-align: left; font-weight: 600; border-bottom: 1.2px solid #1f2933; }
td.n, th.n { text-align: right; white-space: nowrap; }
tr { break-inside: avoid; page-break-inside: avoid; }
thead { display: table-header-group; }
table.kv th { width: 38%; border-bottom: 0.5px solid #9aa5b1; font-weight: 600; }
table.small { font-size: 8pt; }
table.small td, table.small th { white-space: nowrap; }
table.small td:last-child, table.small th:last-child { white-space: normal; width: 99%; }
figure { margin: 3mm 0 5mm; break-inside: avoid; page-break-inside: avoid; }
figure svg { display: block; width: 100%; height: auto; max-height: 205mm; }
figcaption { font-size: 8.5pt; margin-top: 1.5mm; }
.fig-page { break-before: page; page-break-before: always; }
.keep { break-inside: avoid; page-break-inside: avoid; }
.big { font-size: 14pt; font-weight: 700; }
.blocked { border: 2px solid #b45309; padding: 2mm 3mm; break-inside: avoid; }
ul { margin: 1mm 0 2mm; padding-left: 5mm; }
li { margin: 0.6mm 0; }
.muted { color: #52606d; }
`;
}

function kvTable(rows: [string, string][]): string {
  return `<table class="kv"><tbody>${rows.map(([k, v]) => `<tr><th>${esc(k)}</th><td>${esc(v)}</td></tr>`).join('')}</tbody></table>`;
}

/** Field D per soil layer beside the laboratory-model Dmin at the test's frequency, with its caution. */
function fieldDampingSection(d: ReportData, u: UnitSystem, dep: string): string {
  const f = d.fieldDamping;
  if (!f) return '';
  const pct = (x: number | null) => (x === null || !Number.isFinite(x) ? '–' : x.toFixed(2));
  const body = f.rows.length
    ? table(
        [
          { text: 'Soil layer' },
          { text: `Top (${dep})`, num: true },
          { text: `Bottom (${dep})`, num: true },
          { text: 'Field D (%)', num: true },
          { text: '± (%)', num: true },
          { text: 'Frequency (Hz)', num: true },
          { text: 'Laboratory Dmin (%)', num: true },
        ],
        f.rows.map((r) => [
          esc(r.layer),
          reportedText('distance', r.topM, u),
          reportedText('distance', r.bottomM, u),
          pct(r.fieldDPct),
          pct(r.fieldDSdPct),
          r.frequencyHz.toFixed(0),
          pct(r.labDminPct),
        ]),
        'small',
      )
    : `<p>No field damping for this survey${f.reason ? `: ${esc(f.reason)}` : ''}.</p>`;
  return `<section class="keep" id="field-damping"><h2>Field damping beside laboratory Dmin</h2><p class="muted">Field D = 1/(2Q) from the spectral ratio of the two receivers of one hit; laboratory Dmin from the Darendeli (2001) model at the field frequency.</p>${body}<div class="caution-box" data-testid="field-damping-caution">${esc(f.caution)}</div></section>`;
}

function table(head: { text: string; num?: boolean }[], rows: string[][], cls = ''): string {
  const th = head.map((h) => `<th${h.num ? ' class="n"' : ''}>${esc(h.text)}</th>`).join('');
  const body = rows
    .map((r) => `<tr>${r.map((cell, i) => `<td${head[i]?.num ? ' class="n"' : ''}>${esc(cell)}</td>`).join('')}</tr>`)
    .join('');
  return `<table${cls ? ` class="${cls}"` : ''}><thead><tr>${th}</tr></thead><tbody>${body}</tbody></table>`;
}

function figureBlock(f: Figure, n: number, breakBefore: boolean): string {
  return `<figure id="fig-${f.id}"${breakBefore ? ' class="fig-page"' : ''}>${f.svg}<figcaption><b>Figure ${n}. ${esc(f.title)}.</b> ${esc(f.caption)}</figcaption></figure>`;
}

const QUANTITY_WORDS: [ReportedQuantity, string][] = [
  ['time', 'Times (ms)'],
  ['distance', 'Depths and distances'],
  ['velocity', 'Velocities, Vs30, Vs1'],
  ['velocitySd', 'Velocity uncertainties (one standard deviation)'],
  ['modulus', 'Moduli (Gmax, E, M, K)'],
  ['modulusSd', 'Modulus uncertainties'],
  ['stress', 'Stresses'],
  ['density', 'Density and unit weight'],
  ['poissonRatio', 'Poisson’s ratio, stress exponent'],
  ['percent', 'Class probabilities (%)'],
];

export function digitRulesTable(units: UnitSystem): string {
  return table(
    [{ text: 'Quantity' }, { text: 'Shown to' }],
    QUANTITY_WORDS.map(([q, w]) => {
      let words = ruleWords(digitRule(q, units));
      if (q === 'time') words += ' (0.01 ms)';
      if (q === 'distance') words += units === 'SI' ? ' (0.01 m)' : ' (0.1 ft)';
      return [w, words];
    }),
    'small',
  );
}

/** Method notes: what the numbers mean (our own summary of the methods the pipeline uses). */
export function methodNotes(units: UnitSystem): string {
  const notes = [
    'Working traces: per receiver and depth, the difference of the reversed hits for S (it keeps the shear wave, whose polarity reverses, and cancels P and common noise) and their sum for P; detrended and tapered; a band-pass only where the settings say so.',
    'Picks: the first arrival (onset) by the Akaike information criterion (Maeda 1985) or STA/LTA (Allen 1978) inside a window set by the path length and the plausible velocity range; characteristic points (first peak, first trough, zero crossing); delays between paired traces by cross-correlation with a sub-sample peak and by the cross-spectrum phase slope. Every pick can be checked and corrected by hand; edited picks are marked.',
    'Interval velocity: V = (L2 − L1)/(t2 − t1) with straight source-receiver distances L (ASTM D7400 for downhole, D4428/D4428M for crosshole); one-receiver downhole surveys also get refracted-ray (Snell’s law) layer velocities. The uncertainty (one standard deviation) combines the pick or delay uncertainty with the position uncertainty setting.',
    'Flags: “slow?”/“fast?” outside the plausible range, “methods differ” when the other methods’ median differs by more than the set share, “edited”, “low snr”, “low correlation”, “at lag bound”, and the stiffness flags.',
    'Stiffness: ρ = γ/g from the soil column; Gmax = ρ Vs²; Poisson’s ratio from Vp/Vs unless Vp is that of the pore water (then the layer’s value); Vs1 = Vs (Pa/σ′v)^n with Pa = 101.325 kPa and σ′v at mid-interval.',
    'Site: Vs30 = 30/Σ(d/Vs) over the top 30 m (EN 1998-1:2004 eq. 3.1; ASCE 7 chapter 20); a Monte Carlo draw of every interval velocity from its uncertainty gives the 5, 50 and 95 percentiles and the chance of each class under ASCE 7-16 Table 20.3-1, ASCE 7-22 Table 20.2-1 and EN 1998-1:2004 Table 3.1. A class from Vs alone is a screening result.',
    'Significant digits: ASTM D7400 (1.4) asks that recorded and calculated values follow Practice D6026. The report and the CSV exports show each quantity to the digits in the table below; a dropped part of exactly one half rounds the last kept digit to even (the rounding method D6026 takes from Practice E29). The project file keeps full precision.',
  ];
  return `<ul>${notes.map((n) => `<li>${esc(n)}</li>`).join('')}</ul>${digitRulesTable(units)}`;
}

function siteSection(d: ReportData): string {
  const u = d.title.units;
  const vel = unitSpec('velocity', u).label;
  const dep = unitSpec('depth', u).label;
  const s = d.site;
  if (s.setupProblems.length)
    return (
      `<div class="blocked" data-testid="setup-incomplete"><p class="big">Set-up incomplete: Vs30 and site class not given</p>` +
      `<p>The survey set-up has problems that make the velocities unreliable. Fix these and make the report again:</p>` +
      `<ul>${s.setupProblems.map((p) => `<li>${esc(p)}</li>`).join('')}</ul></div>`
    );
  if (s.vs30Mps === null) return '<p>No time-averaged velocity: the profile has no interval with a velocity.</p>';
  const out: string[] = [
    `<p class="big">Vs30 = ${reportedText('velocity', s.vs30Mps, u)} ${esc(vel)}</p>`,
    `<p>Averaged over ${reportedText('distance', s.toDepthM, u)} ${dep}${s.extended ? ' (deepest velocity extended to 30 m)' : ''}; profile to ${reportedText('distance', s.profileDepthM, u)} ${dep}${s.flags.length ? `; ${esc(s.flags.join(', '))}` : ''}.</p>`,
  ];
  if (s.spread)
    out.push(
      `<p>Spread from the interval uncertainties (${s.spread.draws} draws): 5th percentile ${reportedText('velocity', s.spread.p05Mps, u)}, median ${reportedText('velocity', s.spread.p50Mps, u)}, 95th percentile ${reportedText('velocity', s.spread.p95Mps, u)} ${esc(vel)}.</p>`,
    );
  out.push(
    table(
      [{ text: 'Standard' }, { text: 'Class' }, { text: 'Chance of each class (from the spread)' }],
      s.classes.map((k) => [
        k.standard,
        k.siteClass,
        k.probabilities.length
          ? k.probabilities
              .filter(([, p]) => p > 0)
              .map(([cl, p]) => `${cl} ${reportedText('percent', p * 100, u)} %`)
              .join(' · ')
          : '–',
      ]),
    ),
  );
  out.push(
    '<p class="muted">Classes from the measured Vs30 only, with the questions beyond Vs30 answered as listed under the settings.</p>',
  );
  return out.join('');
}

export function reportHtml(d: ReportData, options: ReportOptions = {}): string {
  const paper = options.paper ?? 'A4';
  const u = d.title.units;
  const dep = unitSpec('depth', u).label;
  const vel = unitSpec('velocity', u).label;
  const mod = unitSpec('modulus', u).label;
  const str = unitSpec('stress', u).label;
  const figs = reportFigures(d);
  const t = d.title;
  const titleRows: [string, string][] = [
    ['Project', t.project],
    ['Site', t.site ?? 'not given'],
    [t.holes.length > 1 ? 'Holes' : 'Hole', t.holes.join(', ') || 'not given'],
    ['Test', t.testKind],
    ['Test date', t.testDate ?? 'not given'],
    ['Units', u === 'SI' ? `SI (${dep}, ${vel}, ${mod}, ${str})` : `US customary (${dep}, ${vel}, ${mod}, ${str})`],
    ['Software', `Borewave ${t.softwareVersion}`],
    [
      'Report made',
      t.madeAt
        .replace('T', ' ')
        .replace(/\.\d+Z$/, ' UTC')
        .replace(/Z$/, ' UTC'),
    ],
  ];
  const profileRows = d.profile.map((r) => [
    reportedText('distance', r.topM, u),
    reportedText('distance', r.bottomM, u),
    reportedText('velocity', r.vsMps, u),
    reportedText('velocitySd', r.vsSdMps, u),
    reportedText('velocity', r.vpMps, u),
    reportedText('modulus', r.gmaxKpa, u),
    reportedText('modulusSd', r.gmaxSdKpa, u),
    reportedText('velocity', r.vs1Mps, u),
    reportedText('stress', r.sigmaVEffKpa, u),
    r.method,
    r.flags.join(', '),
  ]);
  const intervalRows = d.intervals.map((r) => [
    reportedText('distance', r.topM, u),
    reportedText('distance', r.bottomM, u),
    r.wave,
    r.method,
    reportedText('time', r.dtS, u),
    reportedText('velocity', r.velocityMps, u),
    reportedText('velocitySd', r.velocitySdMps, u),
    r.range95Mps
      ? `${reportedText('velocity', r.range95Mps[0], u)}–${reportedText('velocity', r.range95Mps[1], u)}`
      : '–',
    r.otherMethodsMps
      ? `${reportedText('velocity', r.otherMethodsMps[0], u)}–${reportedText('velocity', r.otherMethodsMps[1], u)}`
      : '–',
    r.flags.join(', '),
  ]);
  const layerRows = d.layerFits.map((f) => [
    f.wave,
    reportedText('distance', f.topM, u),
    reportedText('distance', f.bottomM, u),
    f.method,
    reportedText('velocity', f.velocityMps, u),
    reportedText('velocitySd', f.velocitySdMps, u),
    String(f.stations),
    reportedText('time', f.rmsMisfitS, u),
    f.flags.join(', '),
  ]);
  const body = [
    `<header class="keep"><h1>Borehole seismic velocity report</h1>`,
    `<p class="subtitle">${esc([t.project, t.site, t.holes.join(', '), t.testKind].filter(Boolean).join(' · '))}</p>`,
    kvTable(titleRows),
    `<div class="caution-box" data-testid="caution-top">${esc(d.cautions[0] ?? '')}</div></header>`,
    `<section class="keep"><h2>Settings that decide the result</h2>${kvTable(d.settings.map((s) => [s.label, s.value]))}</section>`,
    figureBlock(figs[0], 1, true),
    figureBlock(figs[1], 2, false),
    figureBlock(figs[2], 3, false),
    figureBlock(figs[3], 4, false),
    `<section><h2>Profile: Vs, Vp, Gmax and Vs1</h2>`,
    table(
      [
        { text: `Top (${dep})`, num: true },
        { text: `Bottom (${dep})`, num: true },
        { text: `Vs (${vel})`, num: true },
        { text: `± (${vel})`, num: true },
        { text: `Vp (${vel})`, num: true },
        { text: `Gmax (${mod})`, num: true },
        { text: `± (${mod})`, num: true },
        { text: `Vs1 (${vel})`, num: true },
        { text: `σ′v (${str})`, num: true },
        { text: 'Method' },
        { text: 'Flags' },
      ],
      profileRows,
      'small',
    ),
    `</section><section><h2>Intervals: the value used, its method and flags</h2>`,
    `<p class="muted">One row per interval and wave; “±” is one standard deviation; “95% range” is V ∓ k95 × sd, the interval within which 95% of the bench’s training intervals’ true velocity fell (k95 per test kind and method; the errors are heavier-tailed than a Gaussian); “other methods” gives the lowest and highest velocity of the other methods for the same interval.</p>`,
    table(
      [
        { text: `Top (${dep})`, num: true },
        { text: `Bottom (${dep})`, num: true },
        { text: 'Wave' },
        { text: 'Method' },
        { text: 'Δt (ms)', num: true },
        { text: `V (${vel})`, num: true },
        { text: `± (${vel})`, num: true },
        { text: `95% range (${vel})`, num: true },
        { text: `Other methods (${vel})`, num: true },
        { text: 'Flags' },
      ],
      intervalRows,
      'small',
    ),
    `</section><section><h2>Layers</h2>`,
    layerRows.length
      ? table(
          [
            { text: 'Wave' },
            { text: `Top (${dep})`, num: true },
            { text: `Bottom (${dep})`, num: true },
            { text: 'Method' },
            { text: `V (${vel})`, num: true },
            { text: `± (${vel})`, num: true },
            { text: 'Stations', num: true },
            { text: 'RMS misfit (ms)', num: true },
            { text: 'Flags' },
          ],
          layerRows,
          'small',
        )
      : '<p>No layer fits for this survey (crosshole, or fewer than two stations per layer).</p>',
    `</section><section class="keep" id="site"><h2>Vs30 and site class</h2>${siteSection(d)}</section>`,
    fieldDampingSection(d, u, dep),
    d.notes.length
      ? `<section><h2>Notes on this data set</h2><ul>${d.notes.map((n) => `<li>${esc(n)}</li>`).join('')}</ul></section>`
      : '',
    `<section><h2>Method notes</h2>${methodNotes(u)}</section>`,
    `<section class="keep" id="cautions"><h2>Cautions</h2><ul>${d.cautions.map((c) => `<li>${esc(c)}</li>`).join('')}</ul></section>`,
  ].join('\n');
  const title = `Borewave report – ${t.project}`;
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">
<title>${esc(title)}</title>
<style>${css(paper)}</style>
</head>
<body>
${body}
</body>
</html>
`;
}
