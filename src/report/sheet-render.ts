/** The fill checklist in three formats, each a pure function of the sheet model. */
import type { SheetCheck, SheetModel } from './sheet-model.js';
import { padTable } from './format.js';
import { LABEL_STYLE, wrapWords } from './wrap.js';

const esc = (s: string) =>
  s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
const BOX = '&#9744;';

const CSS = (paper: 'a4' | 'letter') =>
  [
    '',
    `@page { size: ${paper === 'a4' ? 'A4' : 'letter'}; margin: 12mm; }`,
    `* { box-sizing: border-box; }`,
    `body { font-family: "Liberation Sans", Arial, Helvetica, sans-serif; font-size: 10.5pt; color: ` +
      `#000; margin: 0; }`,
    `h1 { font-size: 16pt; margin: 0 0 2mm 0; }`,
    `h2 { font-size: 11.5pt; margin: 4mm 0 1.5mm 0; border-bottom: 1px solid #000; break-after: ` +
      `avoid; page-break-after: avoid; }`,
    `.block { break-inside: avoid; page-break-inside: avoid; }`,
    `.baro { border: 1px solid #000; padding: 1.5mm 3mm; margin-top: 2mm; font-size: 9.5pt; ` +
      `break-inside: avoid; page-break-inside: avoid; }`,
    `.baro p { margin: 0.6mm 0; }`,
    `.meta { display: flex; gap: 6mm; font-size: 10pt; margin-bottom: 2mm; }`,
    `.field { flex: 1; border-bottom: 1px solid #000; min-height: 6mm; }`,
    `.danger { border: 2.5px solid #000; padding: 2mm 3mm; font-weight: bold; margin: 2mm 0; }`,
    `.headline { border: 1.5px solid #000; padding: 1.2mm 3mm; font-size: 9.5pt; margin: 2mm 0; }`,
    `.cols { display: flex; gap: 6mm; }`,
    `.cols > div { flex: 1; }`,
    `table { border-collapse: collapse; width: 100%; }`,
    `td, th { border: 1px solid #000; padding: 1.2mm 1.5mm; vertical-align: middle; }`,
    `th { background: #eee; font-size: 9pt; text-align: left; }`,
    `table.kv td { border: none; padding: 0.4mm 1mm; }`,
    `table.kv td:first-child { font-weight: bold; width: 22mm; }`,
    `table.steps tr { break-inside: avoid; page-break-inside: avoid; }`,
    `table.steps td.target { font-size: 15pt; font-weight: bold; white-space: nowrap; }`,
    `table.steps td.blank { min-width: 26mm; }`,
    `table.steps td.gauge, table.steps td.band { white-space: nowrap; }`,
    `table.steps td.shared { font-weight: bold; }`,
    `.shared-note { font-size: 9.5pt; margin: 1.5mm 0 0 0; }`,
    `table.steps td.gas { min-width: 32mm; }`,
    `.whole { white-space: nowrap; }`,
    `table.steps td.target .over { display: block; font-size: 8.5pt; font-weight: normal; }`,
    `table.steps td.small { width: 13mm; }`,
    `tr.before td { border-bottom: none; font-weight: bold; font-size: 9.5pt; }`,
    `tr.charge td { border-top: none; font-size: 9.5pt; padding-top: 0.4mm; }`,
    `.unit { font-size: 9pt; font-weight: normal; }`,
    `ul.checks { list-style: none; padding-left: 0; margin: 0; }`,
    `ul.checks li { margin: 0.8mm 0; }`,
    `.label { border: 1.5px dashed #000; padding: 2mm 3mm; font-size: 11pt; break-inside: avoid; ` +
      `page-break-inside: avoid; }`,
    `.findings li { margin: 0.6mm 0; break-inside: avoid; page-break-inside: avoid; }`,
    `.sev { font-weight: bold; text-transform: uppercase; }`,
    `.caution { font-size: 9pt; border-top: 1px solid #000; margin-top: 3mm; padding-top: 1.5mm; }`,
    `.figures { break-inside: avoid; page-break-inside: avoid; }`,
    `.figures .cols > div { flex: 1; }`,
    `.figures svg { width: 100%; height: auto; max-height: 72mm; }`,
    `.legend { font-size: 9pt; }`,
    `footer { font-size: 8pt; margin-top: 2mm; }`,
    `@media screen { body { max-width: 190mm; margin: 8mm auto; } }`,
    '',
  ].join('\n');

/** a check of several lines ('\n'): the first as the item, the rest smaller under it */
const checkHtml = (c: string) => {
  const [first, ...more] = c.split('\n');
  return `<li>${BOX} ${esc(first)}${more.map((l) => `<br><span class="unit">${esc(l)}</span>`).join('')}</li>`;
};
const checkMd = (c: string) => `- [ ] ${c.split('\n').join('<br>')}`;
const checkText = (c: string) => {
  const [first, ...more] = c.split('\n');
  return [...fit('  [ ] ', first), ...more.flatMap((l) => fit('      ', l))];
};

/** the text sheet's width: every line fits an 80-column terminal or page */
export const TEXT_WIDTH = 80;

/**
 * `text` after `head` in rows of TEXT_WIDTH (wrap.ts), the continuation rows under the text after the
 * head, or at column `hang`
 */
function fit(head: string, text: string, hang = head.length): string[] {
  const lead = new RegExp(`^[\\s\\S]{${head.length}}`);
  return wrapWords(head + text, TEXT_WIDTH, { lead, deeper: hang - head.length, keepSpacing: true });
}

/** items ("Ar 0.98") three spaces apart, as many to a line as fit, each line indented two columns */
function packed(items: readonly string[]): string[] {
  const lines: string[] = [];
  for (const it of items) {
    const last = lines.length ? lines[lines.length - 1] : undefined;
    if (last !== undefined && last.length + 3 + it.length <= TEXT_WIDTH)
      lines[lines.length - 1] += `   ${it}`;
    else lines.push(`  ${it}`);
  }
  return lines;
}

/** the gauge cell of a Fills row: its id, and whether it reads above ambient */
const gaugeCell = (id: string, reference: 'absolute' | 'gauge') =>
  `<td class="gauge">${esc(id)}${reference === 'gauge' ? '<br><span class="unit">gauge-referenced</span>' : ''}</td>`;

/** the cells to write in: actual reading, time, initials, and the tick box */
const BLANKS = `<td class="blank"></td><td class="small"></td><td class="small"></td><td>${BOX}</td>`;

/** a band cell of the Fills table: "low &ndash; high", or a band finer than the display step in words (may wrap) */
function bandHtml(band: string, shared = false): string {
  const cls = [...(band.startsWith('+-') ? [] : ['band']), ...(shared ? ['shared'] : [])].join(' ');
  return (
    `<td${cls ? ` class="${cls}"` : ''}>` +
    `${esc(band).replace(' - ', ' &ndash; ').replace('+-', '&plusmn;')}</td>`
  );
}

/**
 * a check reading as a row of the Fills table (the premix tank before it delivers), its note under it;
 * `shared`: the table has the shared-band column (left blank here)
 */
function checkRowHtml(c: SheetCheck, shared: boolean): string {
  return (
    `<tr class="check"><td></td><td class="gas"><b class="whole">${esc(c.what)}</b><br>` +
    `<span class="unit">${esc(c.when)}</span></td>${gaugeCell(c.gauge, c.reference)}` +
    `<td class="target"><span class="over">at least</span>${esc(c.minimum)} <span class="unit">` +
    `${esc(c.unit)}</span></td><td class="band">planned<br>${esc(c.planned)}</td>` +
    `${shared ? '<td></td>' : ''}${BLANKS}</tr>` +
    `<tr class="charge"><td></td><td colspan="${shared ? 9 : 8}">${esc(c.note)}</td></tr>`
  );
}

function paragraphs(lines: readonly string[]): string {
  return lines.map((l) => `<p>${esc(l)}</p>`).join('');
}

/**
 * The rows of the Fills table: each fill with what comes before it (gauges closed off, its own dangers
 * and warnings, the premix tank's check reading) and its notes under it; the shared band in its own
 * column where readings inside every band can fail together (band-edges-past-tolerance)
 */
function stepsHtml(m: SheetModel): string {
  const shared = m.sharedNote !== undefined;
  const all = shared ? 10 : 9;
  const under = (n: number, html: string) =>
    `<tr class="charge" data-fill="${n}"><td></td><td colspan="${all - 1}">${html}</td></tr>`;
  return m.rows
    .map((r) => {
      const before = r.before.length
        ? `<tr class="before"><td colspan="${all}">Before fill ${r.n}: ${r.before.map(esc).join('; ')}</td></tr>`
        : '';
      const cautions = r.cautions
        .map(
          (c) =>
            `<tr class="before caution" data-fill="${r.n}"><td colspan="${all}">Fill ${r.n}: ` +
            `${c.severity.toUpperCase()} ${esc(c.code)}: ${esc(c.message)}</td></tr>`,
        )
        .join('');
      const check = r.check ? checkRowHtml(r.check, shared) : '';
      const charge = r.charge ? `, charge ${r.charge.number} of ${r.charge.of}` : '';
      const note =
        (r.noneInside ? under(r.n, `<b>${esc(r.noneInside)}</b>`) : '') +
        (r.sharedNoneInside ? under(r.n, `<b>${esc(r.sharedNoneInside)}</b>`) : '') +
        (r.chargeNote ? under(r.n, esc(r.chargeNote)) : '');
      return (
        `${before}${cautions}${check}<tr><td>${r.n}</td><td class="gas"><b>${esc(r.fill)}</b>${esc(charge)}` +
        `<br><span class="unit">${esc(r.source)}</span></td>${gaugeCell(r.gauge, r.reference)}` +
        `<td class="target">${esc(r.target)} <span class="unit">${esc(r.unit)}</span></td>` +
        `${bandHtml(r.band)}${shared ? bandHtml(r.shared ?? '', true) : ''}${BLANKS}</tr>${note}`
      );
    })
    .join('\n');
}

export function sheetToHtml(m: SheetModel): string {
  const kv = (rows: readonly [string, string][]) =>
    `<table class="kv">${rows
      .map(([k, v]) => `<tr><td>${esc(k)}</td><td>${v.split('\n').map(esc).join('<br>')}</td></tr>`)
      .join('')}</table>`;
  const steps = stepsHtml(m);
  const findings = m.findings.length
    ? `<ul class="findings">${m.findings
        .map(
          (f) =>
            `<li><span class="sev">${esc(f.severity)}</span> ${esc(f.code)} (${esc(f.where)}): ` +
            `${esc(f.message)}</li>`,
        )
        .join('')}</ul>`
    : '<p>No findings.</p>';
  const figures = m.diagram
    ? `<section class="figures"><h2>Fuel / O2 / inert diagram</h2><div class="cols"><div>` +
      `${m.diagram.triangle}</div><div>${m.diagram.detail}</div></div><p ` +
      `class="legend">${esc(m.diagram.legend)}</p></section>`
    : '';
  return [
    `<!DOCTYPE html>`,
    `<html lang="en"><head><meta charset="utf-8"><title>Fill sheet ${esc(m.batchId)}</title><style>` +
      `${CSS(m.paper)}</style></head>`,
    `<body>`,
    `<h1>Fill sheet &mdash; ${esc(m.title)}</h1>`,
    `<div class="meta"><div>Batch <b>${esc(m.batchId)}</b></div><div>Lab: ${esc(m.labName)}</div>` + `</div>`,
    `<div class="meta"><div class="field">Date:</div><div class="field">Operator:</div><div ` +
      `class="field">Checked by:</div></div>`,
    `${m.danger ? `<div class="danger">${esc(m.danger)}</div>` : ''}` +
      `${m.tolerance ? `<div class="headline">${esc(m.tolerance)}</div>` : ''}`,
    `<div class="cols"><div><h2>Design</h2>${kv(m.design)}</div><div><h2>Composition (mole ` +
      `fraction)</h2>${kv(m.composition)}</div></div>`,
    `<section class="block"><h2>Before filling</h2>`,
    `<ul class="checks">${m.preChecks.map(checkHtml).join('')}</ul>` + `</section>`,
    `<section class="block"><h2>Fills (target = reading to stop at, on that gauge)</h2>`,
    `<table class="steps">`,
    `<tr><th>#</th><th>gas / cylinder</th><th>gauge</th><th>target</th><th>band</th>` +
      `${m.sharedNote ? '<th>shared band</th>' : ''}<th>actual reading</th><th>time</th><th>init.</th>` +
      `<th>done</th></tr>`,
    `${steps}`,
    `</table>`,
    `${m.sharedNote ? `<p class="shared-note">${esc(m.sharedNote)}</p>` : ''}`,
    `${m.barometer ? `<div class="baro"><b>Barometer.</b> ${paragraphs(m.barometer)}</div>` : ''}` +
      `</section>`,
    `<section class="block"><h2>After filling</h2>`,
    `<ul class="checks">${m.postChecks.map(checkHtml).join('')}</ul>` + `</section>`,
    `<section class="block"><h2>Tank label</h2>`,
    `<div class="label">${m.label.map(esc).join('<br>')}</div></section>`,
    `<section class="findings-block"><h2>Findings</h2>`,
    `${findings}</section>`,
    `<p class="caution"><b>Caution.</b> ${esc(m.caution)}</p>`,
    `<footer>mixwright ${esc(m.version)} &middot; recipe ${esc(m.recipeId)}</footer>`,
    `${figures}`,
    `</body></html>`,
    '',
  ].join('\n');
}

/** a band in the Markdown table: "low – high", or "±half: ..." in words */
const bandMd = (band: string) => band.replace(' - ', ' – ').replace('+-', '±');

/**
 * The Fills table in Markdown: a row per fill with what comes before it and its notes under it, the
 * shared band in its own column and said under the table where band-edges-past-tolerance fires
 */
function fillsMarkdown(m: SheetModel): string[] {
  const shared = m.sharedNote !== undefined;
  // a row of notes: the text in the second column, the rest blank
  const blank = shared ? '| | | | | | | | |' : '| | | | | | | |';
  const out = [
    '## Fills (target = reading to stop at, on that gauge)',
    '',
    `| # | gas / cylinder | gauge | target | band |${shared ? ' shared band |' : ''} actual reading | time | ` +
      'init. | done |',
    `|---:|---|---|---:|---|${shared ? '---|' : ''}---|---|---|---|`,
  ];
  for (const r of m.rows) {
    for (const b of r.before) out.push(`| | **before fill ${r.n}: ${b}** ${blank}`);
    for (const c of r.cautions)
      out.push(
        `| | **fill ${r.n}: ${c.severity.toUpperCase()} ${c.code}:** ${c.message.replace(/\|/g, '\\|')} ` +
          blank,
      );
    const c = r.check;
    if (c)
      out.push(
        `| | **${c.what}** (${c.when}) | ${c.gauge}${c.reference === 'gauge' ? ' (gauge-ref.)' : ''} ` +
          `| **at least ${c.minimum} ${c.unit}** | planned ${c.planned} |${shared ? ' |' : ''} | | | [ ] |`,
        `| | ${c.note} ${blank}`,
      );
    out.push(
      `| ${r.n} | **${r.fill}**${r.charge ? `, charge ${r.charge.number} of ${r.charge.of}` : ''} ` +
        `(${r.source}) | ${r.gauge}${r.reference === 'gauge' ? ' (gauge-ref.)' : ''} ` +
        `| **${r.target} ${r.unit}** | ${bandMd(r.band)} |${shared ? ` **${bandMd(r.shared ?? '')}** |` : ''}` +
        ' | | | [ ] |',
    );
    if (r.noneInside) out.push(`| | **${r.noneInside}** ${blank}`);
    if (r.sharedNoneInside) out.push(`| | **${r.sharedNoneInside}** ${blank}`);
    if (r.chargeNote) out.push(`| | ${r.chargeNote} ${blank}`);
  }
  if (m.sharedNote) out.push('', m.sharedNote);
  return out;
}

export function sheetToMarkdown(m: SheetModel): string {
  const out: string[] = [];
  out.push(
    `# Fill sheet — ${m.title}`,
    '',
    `Batch **${m.batchId}** · Lab: ${m.labName}`,
    '',
    'Date: ________  Operator: ________  Checked by: ________',
    '',
  );
  if (m.danger) out.push(`> **${m.danger}**`, '');
  if (m.tolerance) out.push(`> **${m.tolerance}**`, '');
  out.push(
    '## Design',
    '',
    '| | |',
    '|---|---|',
    ...m.design.map(([k, v]) => `| ${k} | ${v.split('\n').join('<br>')} |`),
    '',
  );
  out.push(
    '## Composition (mole fraction)',
    '',
    '| species | x |',
    '|---|---:|',
    ...m.composition.map(([k, v]) => `| ${k} | ${v} |`),
    '',
  );
  out.push('## Before filling', '', ...m.preChecks.map(checkMd), '');
  out.push(...fillsMarkdown(m));
  if (m.barometer) out.push('', `**Barometer.** ${m.barometer.join(' ')}`);
  out.push('', '## After filling', '', ...m.postChecks.map(checkMd), '');
  out.push('## Tank label', '', '```', ...m.label, '```', '');
  out.push('## Findings', '');
  if (m.findings.length)
    out.push(...m.findings.map((f) => `- **${f.severity}** ${f.code} (${f.where}): ${f.message}`));
  else out.push('No findings.');
  out.push('', `**Caution.** ${m.caution}`, '');
  if (m.diagram)
    out.push(
      '## Fuel / O2 / inert diagram',
      '',
      m.diagram.triangle,
      '',
      m.diagram.detail,
      '',
      m.diagram.legend,
      '',
    );
  out.push(`*mixwright ${m.version} · recipe ${m.recipeId}*`, '');
  return out.join('\n');
}

export function sheetToText(m: SheetModel): string {
  const out: string[] = [];
  const rule = '='.repeat(78);
  out.push(
    rule,
    ...fit('FILL SHEET  ', m.title),
    // the lab on a line of its own where it does not fit beside the batch
    ...(`Batch ${m.batchId}    Lab: ${m.labName}`.length <= TEXT_WIDTH
      ? [`Batch ${m.batchId}    Lab: ${m.labName}`]
      : [`Batch ${m.batchId}`, ...fit('Lab: ', m.labName)]),
    '',
    'Date: ____________   Operator: ____________   Checked by: ____________',
    rule,
    '',
  );
  if (m.danger) out.push(...fit('*** ', `${m.danger} ***`), '');
  if (m.tolerance) out.push(...fit('*** ', `${m.tolerance} ***`), '');
  out.push('DESIGN');
  for (const [k, v] of m.design) {
    const [first, ...more] = v.split('\n');
    // a key longer than its column (the predicted U) hangs its value's rows at 4 columns
    const hang = k.length > 10 ? 4 : 13;
    out.push(...fit(`  ${k.padEnd(10)} `, first, hang), ...more.flatMap((l) => fit(' '.repeat(hang), l)));
  }
  out.push('', 'COMPOSITION (mole fraction)', ...packed(m.composition.map(([k, v]) => `${k} ${v}`)), '');
  out.push('BEFORE FILLING');
  for (const c of m.preChecks) out.push(...checkText(c));
  out.push('', 'FILLS (target = reading to stop at, on that gauge; write in the line under each)');
  out.push(...fillsText(m));
  if (m.barometer) out.push('', 'BAROMETER', ...m.barometer.flatMap((l) => fit('  ', l, 4)));
  out.push('', 'AFTER FILLING');
  for (const c of m.postChecks) out.push(...checkText(c));
  out.push('', 'TANK LABEL');
  for (const l of m.label) out.push(...wrapWords(l, TEXT_WIDTH - 4, LABEL_STYLE).map((r) => `  | ${r}`));
  out.push('', 'FINDINGS');
  if (m.findings.length)
    for (const f of m.findings)
      out.push(...fit(`  ${f.severity.toUpperCase().padEnd(7)} `, `${f.code} (${f.where}): ${f.message}`));
  else out.push('  none');
  out.push('', ...fit('CAUTION: ', m.caution, 2), '');
  if (m.diagram) out.push(...fit('DIAGRAM: ', `see the HTML or PDF sheet. ${m.diagram.legend}`, 2), '');
  out.push(`mixwright ${m.version} - recipe ${m.recipeId}`);
  return out.join('\n') + '\n';
}

/** a Fills band in the table: "low-high", or the half-width alone of a band said in words ("+-0.0039: ...") */
const bandCell = (band: string) => band.replace(' - ', '-').replace(/:.*$/, '');

/** the blanks written in at each row of the Fills table, on a line of their own under it */
const BLANKS_TEXT = '     actual __________   time _____   init ____   done [ ]';

/**
 * The Fills table of the text sheet: a row per fill (and per check reading: the premix tank before it
 * delivers, above its fill) with what to read, the blanks to write in on the line under it, and the
 * fill's notes ("^") and what comes before it (">>") in its place.
 */
function fillsText(m: SheetModel): string[] {
  const out: string[] = [];
  const shared = m.sharedNote !== undefined;
  const rows: string[][] = [
    ['#', 'gas', 'cylinder', 'gauge', 'target', 'band', ...(shared ? ['shared band'] : [])],
  ];
  // a check row (the premix tank's reading) sits in the table above its fill, in the same columns
  const checkRow = (c: SheetCheck) => [
    '',
    'check',
    c.what.replace(/^Premix tank /, ''),
    c.gauge + (c.reference === 'gauge' ? ' (g)' : ''),
    `>= ${c.minimum} ${c.unit}`,
    `plan ${c.planned}`,
    ...(shared ? [''] : []),
  ];
  for (const r of m.rows) if (r.check) rows.push(checkRow(r.check));
  for (const r of m.rows)
    rows.push([
      String(r.n),
      r.charge ? `${r.fill} ${r.charge.number}/${r.charge.of}` : r.fill,
      r.source,
      r.gauge + (r.reference === 'gauge' ? ' (g)' : ''),
      `${r.target} ${r.unit}`,
      bandCell(r.band),
      ...(shared ? [bandCell(r.shared ?? '')] : []),
    ]);
  const table = padTable(rows, [true, false, false, false, true, true, true]);
  const checks = m.rows.filter((r) => r.check).length;
  out.push(`  ${table[0]}`);
  let k = 1;
  m.rows.forEach((r, i) => {
    for (const b of r.before) out.push(...fit('  >> ', `before fill ${r.n}: ${b}`));
    for (const c of r.cautions)
      out.push(...fit('  >> ', `fill ${r.n}: ${c.severity.toUpperCase()} ${c.code}: ${c.message}`));
    if (r.check) out.push(`  ${table[k++]}`, BLANKS_TEXT, ...fit('     ^ ', r.check.note));
    out.push(`  ${table[checks + i + 1]}`);
    // a band the display cannot show as "low-high": its half-width in the table, the words under it
    if (bandCell(r.band) !== r.band.replace(' - ', '-'))
      out.push(...fit('     ^ ', `fill ${r.n}: band ${r.band}`));
    if (r.shared !== undefined && bandCell(r.shared) !== r.shared.replace(' - ', '-'))
      out.push(...fit('     ^ ', `fill ${r.n}: shared band ${r.shared}`));
    out.push(BLANKS_TEXT);
    if (r.noneInside) out.push(...fit('     ^ ', `fill ${r.n}: ${r.noneInside}`));
    if (r.sharedNoneInside) out.push(...fit('     ^ ', `fill ${r.n}: ${r.sharedNoneInside}`));
    if (r.chargeNote) out.push(...fit('     ^ ', `fill ${r.n}: ${r.chargeNote}`));
  });
  if (m.sharedNote) out.push(...fit('  ', m.sharedNote));
  return out;
}
