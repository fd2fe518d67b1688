/** The batch certificate with its tank label, in three formats, each a pure function of the model. */
import { FINDINGS_KEY, type CertificateModel } from './label-certificate.js';
import { DANGER_HEADLINE, notDesign } from './label-model.js';
import { padTable } from './format.js';
import { wrapWords } from './wrap.js';

const esc = (s: string) =>
  s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
/** the text form writes "+-"; the printed forms the sign itself */
const pm = (s: string) => s.replace(/\+-/g, '±');
/** drawn as a warning: a failed re-check, or a log that records a danger whatever the composition */
const bad = (m: CertificateModel) => notDesign(m.label.status) || m.label.danger;

const CSS = (paper: 'a4' | 'letter') =>
  [
    '',
    `@page { size: ${paper === 'a4' ? 'A4' : 'letter'}; margin: 11mm; }`,
    `* { box-sizing: border-box; }`,
    `body { font-family: "Liberation Sans", Arial, Helvetica, sans-serif; font-size: 9pt; color: ` +
      `#000; margin: 0; }`,
    `h1 { font-size: 15pt; margin: 0 0 1.5mm 0; }`,
    `h2 { font-size: 10.5pt; margin: 2.2mm 0 0.8mm 0; border-bottom: 1px solid #000; break-after: ` +
      `avoid; page-break-after: avoid; }`,
    `.meta { display: flex; flex-wrap: wrap; gap: 1mm 6mm; font-size: 9pt; margin-bottom: 1.5mm; }`,
    `.verdict { border: 2px solid #000; padding: 1.2mm 3mm; margin: 1.5mm 0; font-weight: bold; }`,
    `.verdict.fail { border-width: 4px; font-size: 11pt; }`,
    `table { border-collapse: collapse; width: 100%; }`,
    `td, th { border: 1px solid #000; padding: 0.5mm 1.3mm; vertical-align: top; }`,
    `th { background: #eee; font-size: 8.5pt; text-align: left; }`,
    `td.num { text-align: right; white-space: nowrap; }`,
    `td.out { font-weight: bold; }`,
    `tr { break-inside: avoid; page-break-inside: avoid; }`,
    `ul { margin: 0; padding-left: 5mm; }`,
    `li { margin: 0.4mm 0; }`,
    `.findings li { font-size: 8.5pt; margin: 0.2mm 0; }`,
    `.findings p.notes { font-size: 8pt; margin: 0.8mm 0 0 0; }`,
    `p { margin: 1mm 0; }`,
    `.sev { font-weight: bold; text-transform: uppercase; }`,
    `.small { font-size: 8.5pt; }`,
    `.block { break-inside: avoid; page-break-inside: avoid; }`,
    `.labelbox { border: 1.5px dashed #000; padding: 2mm 3mm; font-size: 10pt; break-inside: avoid; ` +
      `page-break-inside: avoid; }`,
    `.labelbox.fail { border: 4px solid #000; }`,
    `.labelbox .head { font-weight: bold; }`,
    `.labelbox.fail .head { font-size: 11pt; }`,
    `.labelbox .off { font-weight: bold; }`,
    `.labelbox .grid { display: grid; grid-template-columns: repeat(2, auto); gap: 0 5mm; ` +
      `justify-content: start; white-space: nowrap; }`,
    `.labelbox .hazard { font-weight: bold; }`,
    `.labelrow { display: flex; gap: 5mm; align-items: flex-start; }`,
    `.labelrow .labelbox { flex: 0 0 136mm; }`,
    `.sign { flex: 1; display: flex; flex-direction: column; gap: 3mm; }`,
    `.field { border-bottom: 1px solid #000; min-height: 8mm; font-size: 8.5pt; }`,
    `td.nw { white-space: nowrap; }`,
    `.caution { font-size: 8pt; border-top: 1px solid #000; margin-top: 2mm; padding-top: 0.8mm; }`,
    `footer { font-size: 7.5pt; margin-top: 1mm; }`,
    `@media screen { body { max-width: 190mm; margin: 8mm auto; } }`,
    '',
  ].join('\n');

const NOT_DESIGN = 'DO NOT USE AS THE DESIGN MIXTURE';

function list(items: readonly string[], none: string): string {
  return items.length
    ? `<ul>${items.map((i) => `<li>${esc(pm(i))}</li>`).join('')}</ul>`
    : `<p class="small">${esc(none)}</p>`;
}

/** the tank label to cut out: the verdict first, the as-filled composition, the premix it was made from */
function labelBoxHtml(m: CertificateModel): string {
  const L = m.label;
  const extras = [L.phi ? `phi ${esc(pm(L.phi))}` : '', L.dilution ? `dilution ${esc(pm(L.dilution))}` : '']
    .filter(Boolean)
    .join(' &middot; ');
  return [
    `<div class="labelbox${bad(m) ? ' fail' : ''}">` +
      `${L.danger ? `<div class="head">${esc(DANGER_HEADLINE)}</div>` : ''}<div class="head">` +
      `${esc(L.headline)}</div>${L.offDesign.map((o) => `<div class="off">${esc(o)}</div>`).join('')}` +
      `${L.caveats.map((c) => `<div class="off">${esc(c)}</div>`).join('')}`,
    `<div>Batch <b>${esc(L.batchId)}</b> &middot; tank <b>${esc(L.tank)}</b> &middot; filled ` +
      `${esc(L.filledOn)}</div>`,
    `<div class="small">As filled, mole fraction &plusmn; U (k = 2):</div>`,
    `<div class="grid">` +
      `${L.composition.map((c) => `<div><b>${esc(c.species)}</b> ${esc(pm(c.text))}</div>`).join('')}` +
      `</div>`,
    `<div>${extras}</div>`,
    `<div>${esc(L.finalPressure)} at ${esc(L.finalTemperature)}</div>`,
    ...L.premix.map((p) =>
      p.checked
        ? `<div>Made from premix <b>${esc(p.id ?? '')}</b> in ${esc(p.tank)}, re-checked from its log:</div>` +
          `<div class="grid">${p.fractions.map((f) => `<div>${esc(pm(f))}</div>`).join('')}</div>`
        : `<div class="head">PREMIX IN ${esc(p.tank)} NOT RE-CHECKED: ${esc(p.short ?? '')}</div>` +
          `<div class="off">${esc(p.log)}: the fractions above use the premix as this log recorded it, ` +
          `without its uncertainty</div>`,
    ),
    L.hazards.map((h) => `<div class="hazard">${esc(h)}</div>`).join('') +
      `${notDesign(L.status) ? `<div class="head">${NOT_DESIGN}</div>` : ''}` +
      `${
        L.danger
          ? '<div class="head">DO NOT USE THIS TANK UNTIL IT AND ITS GAUGES HAVE BEEN ' + 'INSPECTED</div>'
          : ''
      }` +
      `</div>`,
  ].join('\n');
}

export function certificateToHtml(m: CertificateModel): string {
  const comp = m.rows
    .map(
      (r) =>
        `<tr><td><b>${esc(r.species)}</b></td><td class="num">${esc(r.design)}</td><td ` +
        `class="num">${esc(pm(r.asFilled))}</td><td class="num">${esc(r.deviation)}</td><td ` +
        (`class="num">${esc(pm(r.tolerance))}</td><td class="${r.status.startsWith('OUT') ? 'out' : ''}">` +
          `${esc(r.status)}</td></tr>`),
    )
    .join('');
  const readings = m.readings
    .map(
      (r) =>
        `<tr><td>${r.step}</td><td class="nw">${esc(r.fill)}</td><td class="nw">${esc(r.gauge)}</td><td ` +
        `class="num">${esc(r.typed)}</td><td class="num">${esc(r.absolute)}</td><td ` +
        (`class="num">${esc(r.temperature)}</td><td class="nw">${esc(r.time)}</td><td>${esc(r.by)}</td>` +
          `<td>${esc(r.note)}</td></tr>`),
    )
    .join('');
  const major = m.findings.filter((f) => f.severity !== 'note');
  const notes = m.findings.filter((f) => f.severity === 'note');
  const findings =
    (major.length
      ? `<ul>` +
        `${major.map((f) => `<li><span class="sev">${esc(f.severity)}</span> ${esc(pm(f.text))}</li>`).join('')}` +
        `</ul>`
      : '') +
    (notes.length
      ? `<p class="notes"><span class="sev">notes</span> ${notes.map((f) => esc(pm(f.text))).join(' &middot; ')}</p>`
      : '') +
    (m.findings.length ? '' : '<p class="small">No findings.</p>');
  const labelBox = labelBoxHtml(m);
  // where the batch's premix came from (none for a batch of cylinders: no section, no line)
  const premixHtml = m.premix.length
    ? `<section class="block"><h2>Premix</h2>${m.premix.map((p) => `<p>${esc(pm(p))}</p>`).join('')}</section>\n`
    : '';
  const amendments =
    m.corrections.length || m.acknowledgements.length
      ? list(m.corrections, 'No corrections logged.') +
        list(m.acknowledgements, 'No acknowledgements logged.')
      : '<p class="small">No corrections and no acknowledgements logged.</p>';
  return [
    `<!DOCTYPE html>`,
    `<html lang="en"><head><meta charset="utf-8"><title>Batch certificate ${esc(m.batchId)}</title>` +
      `<style>${CSS(m.paper)}</style></head>`,
    `<body>`,
    `<h1>Batch certificate &mdash; ${esc(m.title)}</h1>`,
    `<div class="meta"><div>Batch <b>${esc(m.batchId)}</b></div><div>Lab: ${esc(m.lab)}</div>` +
      `<div>Tank: ${esc(m.tank)}</div><div>Log started ${esc(m.created)}, ${esc(m.closed)}</div></div>`,
    `<div class="verdict${bad(m) ? ' fail' : ''}">${esc(m.verdictText)}` +
      `${m.caveats.map((c) => `<br>${esc(c)}`).join('')}</div>`,
    `<section class="block"><h2>Composition: design and as filled (mole fraction, &plusmn; U at k = ` +
      `2)</h2>`,
    `<table><tr><th>species</th><th>design</th><th>as filled &plusmn; U</th><th>deviation (rel.)</th>` +
      `<th>tolerance</th><th>status</th></tr>${comp}`,
    `<tr><td><b>phi</b></td><td class="num">${esc(m.phi[0])}</td><td class="num">${esc(pm(m.phi[1]))}` +
      `</td><td></td><td></td><td></td></tr>`,
    `<tr><td><b>dilution</b></td><td class="num">${esc(m.dilution[0])}</td><td class="num">` +
      `${esc(pm(m.dilution[1]))}</td><td></td><td></td><td></td></tr></table></section>`,
    `${premixHtml}<section class="block"><h2>Readings as logged</h2>`,
    `<table><tr><th>#</th><th>fill</th><th>gauge</th><th>as read</th><th>absolute</th><th>tank T</th>` +
      `<th>time</th><th>by</th><th>note</th></tr>${readings}</table></section>`,
    `<section class="block"><h2>Corrections and acknowledgements</h2>`,
    `${amendments}</section>`,
    `<section class="block findings"><h2>Findings (${esc(FINDINGS_KEY)})</h2>${findings}</section>`,
    `<section class="block"><h2>Tank label (from the readings; cut out)</h2>`,
    `<div class="labelrow">${labelBox}<div class="sign"><div class="field">Checked by:</div><div ` +
      `class="field">Date:</div><div class="field">Label fixed to the tank by:</div></div></div>` +
      `</section>`,
    `<p class="caution"><b>Method.</b> ${esc(m.method)}<br><b>Caution.</b> ${esc(m.caution)}</p>`,
    `<footer>mixwright ${esc(m.version)} &middot; from ${esc(m.file)} &middot; made ` +
      `${esc(m.generated)}</footer>`,
    `</body></html>`,
    '',
  ].join('\n');
}

export function certificateToMarkdown(m: CertificateModel): string {
  const out: string[] = [];
  out.push(
    `# Batch certificate — ${m.title}`,
    '',
    `Batch **${m.batchId}** · Lab: ${m.lab} · Tank: ${m.tank} · Log started ${m.created}, ${m.closed}`,
    '',
  );
  out.push(bad(m) ? `> **${m.verdictText}**` : `**${m.verdictText}**`, '');
  for (const c of m.caveats) out.push(`> **${c}**`, '');
  out.push(
    '## Composition: design and as filled (mole fraction, ± U at k = 2)',
    '',
    '| species | design | as filled ± U | deviation (rel.) | tolerance | status |',
    '|---|---:|---:|---:|---:|---|',
  );
  for (const r of m.rows)
    out.push(
      `| ${r.species} | ${r.design} | ${pm(r.asFilled)} | ${r.deviation} | ${pm(r.tolerance)} ` +
        `| ${r.status.startsWith('OUT') ? `**${r.status}**` : r.status} |`,
    );
  out.push(
    `| phi | ${m.phi[0]} | ${pm(m.phi[1])} | | | |`,
    `| dilution | ${m.dilution[0]} | ${pm(m.dilution[1])} | | | |`,
    '',
  );
  if (m.premix.length) out.push('## Premix', '', ...m.premix.flatMap((p) => [pm(p), '']));
  out.push(
    '## Readings as logged',
    '',
    '| # | fill | gauge | as read | absolute | tank T | time | by | note |',
    '|---:|---|---|---:|---:|---:|---|---|---|',
  );
  for (const r of m.readings)
    out.push(
      `| ${r.step} | ${r.fill} | ${r.gauge} | ${r.typed} | ${r.absolute} | ${r.temperature} ` +
        `| ${r.time} | ${r.by} | ${r.note} |`,
    );
  out.push('', '## Corrections and acknowledgements', '');
  out.push(...(m.corrections.length ? m.corrections.map((c) => `- ${c}`) : ['No corrections logged.']), '');
  out.push(
    ...(m.acknowledgements.length
      ? m.acknowledgements.map((c) => `- ${c}`)
      : ['No acknowledgements logged.']),
    '',
  );
  out.push(`## Findings (${FINDINGS_KEY})`, '');
  out.push(
    ...(m.findings.length ? m.findings.map((f) => `- **${f.severity}** ${pm(f.text)}`) : ['No findings.']),
    '',
  );
  out.push(`**Method.** ${m.method}`, '');
  out.push(
    '## Tank label (from the readings)',
    '',
    '```',
    ...m.labelLines,
    '```',
    '',
    'Checked by: ________  Date: ________',
    '',
  );
  out.push(
    `**Caution.** ${m.caution}`,
    '',
    `*mixwright ${m.version} · from ${m.file} · made ${m.generated}*`,
    '',
  );
  return out.join('\n');
}

/** the text certificate's width: every row fits an 80-column terminal or page */
const TEXT_WIDTH = 80;

/** a paragraph of the text certificate in rows of TEXT_WIDTH, continuations under its text after `lead` */
function para(line: string, lead: RegExp = /^\s*/, deeper = 2): string[] {
  return wrapWords(line, TEXT_WIDTH, { lead, deeper, keepSpacing: true, noOrphan: true });
}

/**
 * a table indented two columns within TEXT_WIDTH: as one table where it fits, else in parts of its
 * columns, each led by the first column (the species, the fill number), one under the other
 */
function fittedTable(rows: readonly (readonly string[])[], align: readonly boolean[]): string[] {
  const room = TEXT_WIDTH - 2;
  const whole = padTable(rows, align);
  if (whole.every((l) => l.length <= room)) return whole.map((l) => `  ${l}`);
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  const groups: number[][] = [[]];
  let used = widths[0];
  for (let c = 1; c < widths.length; c++) {
    const g = groups[groups.length - 1];
    if (g.length && used + 2 + widths[c] > room) {
      groups.push([]);
      used = widths[0];
    }
    groups[groups.length - 1].push(c);
    used += 2 + widths[c];
  }
  return groups.flatMap((g, i) => [
    ...(i ? [''] : []),
    ...padTable(
      rows.map((r) => [r[0], ...g.map((c) => r[c])]),
      [align[0], ...g.map((c) => align[c])],
    ).map((l) => `  ${l}`),
  ]);
}

/**
 * a column's cells without the unit they all share ("Torr"), and that unit (said under its header);
 * else the cells as they are
 */
function unitApart(cells: readonly string[]): [string, string[]] {
  // a row without a value ("-": a vent) has no unit to share
  const valued = cells.filter((c) => c !== '-');
  const units = new Set(valued.map((c) => / (\S+)$/.exec(c)?.[1] ?? ''));
  const [unit] = [...units];
  if (units.size !== 1 || !unit || !valued.every((c) => /^[-+]?[\d.]+ \S+$/.test(c))) return ['', [...cells]];
  return [unit, cells.map((c) => (c === '-' ? c : c.slice(0, -unit.length - 1)))];
}

/**
 * the composition table: the unit said once in "x +- U" (97.998 +- 0.039 %), a tolerance shared by
 * every design row said under it
 */
function compositionText(m: CertificateModel): string[] {
  const once = (s: string) => s.replace(/^(\S+) (%|ppm) \+- (\S+) \2$/, '$1 +- $3 $2');
  const tols = new Set(m.rows.map((r) => r.tolerance).filter((t) => t !== '-'));
  const shared = tols.size === 1 ? [...tols][0] : undefined;
  const rows = [
    ['species', 'design', 'as filled +- U', 'rel. dev.', ...(shared ? [] : ['tolerance']), 'status'],
    ...m.rows.map((r) => [
      r.species,
      r.design,
      once(r.asFilled),
      r.deviation,
      ...(shared ? [] : [r.tolerance]),
      r.status,
    ]),
    ['phi', m.phi[0], once(m.phi[1]), '', ...(shared ? [] : ['']), ''],
    ['dilution', m.dilution[0], once(m.dilution[1]), '', ...(shared ? [] : ['']), ''],
  ];
  return [
    'COMPOSITION (mole fraction, +- U at k = 2)',
    ...fittedTable(rows, [false, true, true, true, ...(shared ? [] : [true]), false]),
    ...(shared ? [`  tolerance ${shared} (relative) on each design fraction`] : []),
    '',
  ];
}

/** the readings: a time on the day the log started without its date; each note under the table */
function readingsText(m: CertificateModel): string[] {
  const day = /^\d{4}-\d{2}-\d{2} /.exec(m.created)?.[0];
  const time = (t: string) => (day && t.startsWith(day) && t.endsWith(' UTC') ? t.slice(day.length, -4) : t);
  const [typedUnit, typed] = unitApart(m.readings.map((r) => r.typed));
  const [absUnit, abs] = unitApart(m.readings.map((r) => r.absolute));
  const [tUnit, temps] = unitApart(m.readings.map((r) => r.temperature));
  const rows = [
    ['#', 'fill', 'gauge', 'as read', 'absolute', 'tank T', day ? 'time UTC' : 'time', 'by'],
    // the units the cells share, under their headers
    ...(typedUnit || absUnit || tUnit ? [['', '', '', typedUnit, absUnit, tUnit, '', '']] : []),
    ...m.readings.map((r, i) => [
      String(r.step),
      r.fill,
      r.gauge,
      typed[i],
      abs[i],
      temps[i],
      time(r.time),
      r.by,
    ]),
  ];
  // by number and fill: the rows after a vent share their fill's number
  const notes = m.readings.filter((r) => r.note).flatMap((r) => para(`  #${r.step} ${r.fill}: ${r.note}`));
  return [
    `READINGS AS LOGGED${day ? ` (times on ${day.trim()})` : ''}`,
    ...fittedTable(rows, [true, false, false, true, true, true, false, false]),
    ...(notes.length ? ['  notes:', ...notes.map((l) => `  ${l}`)] : []),
    '',
  ];
}

/** plain text: the label first (what a terminal user wants), then the certificate, every row within 80 columns */
export function certificateToText(m: CertificateModel): string {
  const out: string[] = [];
  const rule = '='.repeat(78);
  // the lines are wrapped to LABEL_WIDTH (labelLines): the box is at most 80 columns
  const w = Math.max(...m.labelLines.map((l) => l.length));
  const edge = bad(m) ? '#' : '-';
  out.push(
    'TANK LABEL (from the readings)',
    `+${edge.repeat(w + 2)}+`,
    ...m.labelLines.map((l) => `${edge === '#' ? '#' : '|'} ${l.padEnd(w)} ${edge === '#' ? '#' : '|'}`),
    `+${edge.repeat(w + 2)}+`,
    '',
  );
  out.push(
    rule,
    ...para(`BATCH CERTIFICATE  ${m.title}`, /^BATCH CERTIFICATE {2}/, 0),
    // the batch and the lab on one line where they fit, else one under the other
    ...(`Batch ${m.batchId}    Lab: ${m.lab}`.length <= TEXT_WIDTH
      ? [`Batch ${m.batchId}    Lab: ${m.lab}`]
      : [...para(`Batch ${m.batchId}`), ...para(`Lab: ${m.lab}`)]),
    ...para(`Tank ${m.tank}`),
    ...para(`Log started ${m.created}, ${m.closed}`),
    rule,
    '',
  );
  out.push(...para(`VERDICT  ${m.verdictText}`, /^VERDICT {2}/, 0));
  out.push(...m.caveats.flatMap((c) => para(`         ${c}`)), '');
  out.push(...compositionText(m));
  if (m.premix.length) out.push('PREMIX', ...m.premix.flatMap((p) => para(`  ${p}`)), '');
  out.push(...readingsText(m));
  const list = (items: readonly string[], none: string) =>
    items.length ? items.flatMap((c) => para(`  ${c}`)) : [`  ${none}`];
  out.push('CORRECTIONS', ...list(m.corrections, 'none logged'), '');
  out.push('ACKNOWLEDGEMENTS', ...list(m.acknowledgements, 'none logged'), '');
  out.push(
    `FINDINGS (${FINDINGS_KEY})`,
    ...(m.findings.length
      ? m.findings.flatMap((f) => para(`  ${f.severity.toUpperCase().padEnd(7)} ${f.text}`, /^ {2}\S+ +/, 0))
      : ['  none']),
    '',
  );
  out.push(
    ...para(`METHOD: ${m.method}`),
    '',
    ...para(`CAUTION: ${m.caution}`),
    '',
    ...para(`mixwright ${m.version} - from ${m.file} - made ${m.generated}`),
  );
  return out.join('\n') + '\n';
}
