/**
 * The plain library page: a server-rendered HTML view of the library that works without the
 * browser workbench (and without JavaScript). It lists the entries, searches them by text and by
 * duty point, and links to each curve set's JSON. Every stored text passes through `escapeHtml`.
 */
import { fromSI, NOT_AVAILABLE, presetNamed, resolveUnits, showNumber, type PresetName } from '../units/index.ts';
import type { EntryInfo } from '../library/types.ts';
import { matchSentence, type DutySearchView } from '../library/dutyView.ts';

const ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;', '`': '&#96;' };

/** Text → HTML text or attribute value. */
export function escapeHtml(value: unknown): string {
  return String(value ?? '').replace(/[&<>"'`]/g, (c) => ESCAPES[c] as string);
}

export interface LibraryPageInput {
  libraryName: string;
  counts: { entries: number; archived: number; revisions: number; sheets: number };
  units: PresetName;
  q: string;
  total: number;
  entries: EntryInfo[];
  duty?: { flow: string; head: string; static: string };
  search?: DutySearchView;
  /** A sentence shown above everything (why the workbench is not here, a refused query…). */
  message?: string;
  workbenchAvailable: boolean;
}

/** A figure by the one formatter, or "not available" (never NaN). */
const n = (value: number | null | undefined, digits = 4): string => showNumber(value, digits).text;

function entryRows(entries: EntryInfo[], system: PresetName): string {
  const u = resolveUnits(presetNamed(system));
  return entries
    .map((e) => {
      const dia = e.diameters_m.map((d) => n(fromSI(d, u.diameter), 4)).join(', ') || NOT_AVAILABLE.text;
      const flow = `${n(fromSI(e.flow_range_m3s[0], u.flow), 3)} – ${n(fromSI(e.flow_range_m3s[1], u.flow), 3)}`;
      const head = `${n(fromSI(e.head_range_m[0], u.head), 3)} – ${n(fromSI(e.head_range_m[1], u.head), 3)}`;
      const bep = e.bep ? `${n(fromSI(e.bep.flow_m3s, u.flow), 3)} ${u.flow.label} at ${n(fromSI(e.bep.head_m, u.head), 3)} ${u.head.label}, ${n(e.bep.efficiency * 100, 3)} %` : NOT_AVAILABLE.text;
      return `<tr><td><a href="/api/curvesets/${escapeHtml(e.id)}">${escapeHtml(e.name)}</a></td><td>${escapeHtml(e.maker ?? '')}</td><td>${escapeHtml(e.model ?? '')}</td>
<td class="num">${n(e.speed_rpm, 5)}</td><td class="num">${escapeHtml(dia)}</td><td class="num">${escapeHtml(flow)}</td><td class="num">${escapeHtml(head)}</td><td>${escapeHtml(bep)}</td>
<td class="num">${e.revision}</td><td>${escapeHtml(e.updated_at.slice(0, 16).replace('T', ' '))}</td></tr>`;
    })
    .join('\n');
}

function searchSection(view: DutySearchView): string {
  const u = view.units;
  const rows = view.candidates
    .map(
      (c) => `<tr><td><a href="/api/curvesets/${escapeHtml(c.id)}">${escapeHtml(c.name)}</a></td><td>${escapeHtml(c.maker ?? '')}</td>
<td class="num">${n(c.diameter, 4)}${c.trimmed ? ' (trim)' : ''}</td><td class="num">${n(c.efficiency, 3)}</td><td class="num">${n(c.power, 3)}</td>
<td class="num">${n(c.npshr, 3)}</td><td>${escapeHtml(c.por.position)}${c.por.flow_to_bep_percent === null ? '' : ` (${n(c.por.flow_to_bep_percent, 3)} % of BEP flow)`}</td>
<td>${escapeHtml(c.warnings.join(' '))}</td></tr>`,
    )
    .join('\n');
  const head = `Duty ${n(view.duty.flow, 4)} ${escapeHtml(u.flow)} at ${n(view.duty.head, 4)} ${escapeHtml(u.head)}${view.duty.static_head === null ? '' : `, static head ${n(view.duty.static_head, 4)} ${escapeHtml(u.head)}`}`;
  const body = view.candidates.length
    ? `<table><thead><tr><th>Pump</th><th>Maker</th><th>Diameter (${escapeHtml(u.diameter)})</th><th>Efficiency (%)</th><th>Power (${escapeHtml(u.power)})</th><th>NPSHr (${escapeHtml(u.npshr)})</th><th>Against the POR</th><th>Cautions</th></tr></thead>
<tbody>${rows}</tbody></table>`
    : '<p>No pump in the library meets this duty with one of its diameters or a trim between them.</p>';
  const sentence = matchSentence(view);
  return `<section><h2>${head}</h2><p>${escapeHtml(sentence.charAt(0).toUpperCase() + sentence.slice(1))}</p>
${body}<p class="notice">${escapeHtml(view.notice)}</p></section>`;
}

export function renderLibraryPage(input: LibraryPageInput): string {
  const u = resolveUnits(presetNamed(input.units));
  const sel = (v: PresetName) => (input.units === v ? ' selected' : '');
  const d = input.duty ?? { flow: '', head: '', static: '' };
  const c = input.counts;
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Pumpscribe — office pump library</title>
<style>
body{font:14px/1.4 system-ui,sans-serif;margin:1.5rem;color:#1b1f23}
table{border-collapse:collapse;margin:.5rem 0 1.5rem}th,td{border-bottom:1px solid #d8dde3;padding:.3rem .6rem;text-align:left;vertical-align:top}
th{background:#f3f5f7}td.num{text-align:right;font-variant-numeric:tabular-nums}
form{display:flex;gap:.6rem;flex-wrap:wrap;align-items:end;margin:.4rem 0 1rem}label{display:flex;flex-direction:column;font-size:12px}
.message{background:#fff6d6;border:1px solid #e5cf7a;padding:.5rem .8rem}.notice{font-size:12px;color:#5a4a00}
</style></head><body>
<h1>Office pump library</h1>
${input.message ? `<p class="message">${escapeHtml(input.message)}</p>` : ''}
${input.workbenchAvailable ? '<p><a href="/">Open the workbench</a></p>' : ''}
<p>Library file ${escapeHtml(input.libraryName)}: ${c.entries} entries (${c.archived} archived), ${c.revisions} revisions, ${c.sheets} source sheets.</p>
<form method="get" action="/library"><strong>Duty search</strong>
<label>Flow (${escapeHtml(u.flow.label)})<input name="flow" inputmode="decimal" value="${escapeHtml(d.flow)}" required></label>
<label>Head (${escapeHtml(u.head.label)})<input name="head" inputmode="decimal" value="${escapeHtml(d.head)}" required></label>
<label>Static head (${escapeHtml(u.head.label)}, optional)<input name="static" inputmode="decimal" value="${escapeHtml(d.static)}"></label>
<label>Units<select name="units"><option value="si"${sel('si')}>SI (m³/h, m, mm, kW)</option><option value="us"${sel('us')}>US (gpm, ft, in, hp)</option></select></label>
<button>Find pumps</button></form>
${input.search ? searchSection(input.search) : ''}
<form method="get" action="/library"><label>Names contain<input name="q" value="${escapeHtml(input.q)}"></label>
<input type="hidden" name="units" value="${escapeHtml(input.units)}"><button>Filter</button></form>
<table><thead><tr><th>Pump</th><th>Maker</th><th>Model</th><th>Speed (rpm)</th><th>Diameters (${escapeHtml(u.diameter.label)})</th>
<th>Flow (${escapeHtml(u.flow.label)})</th><th>Head (${escapeHtml(u.head.label)})</th><th>BEP (largest diameter)</th><th>Revision</th><th>Updated (UTC)</th></tr></thead>
<tbody>${entryRows(input.entries, input.units) || '<tr><td colspan="10">No entries match.</td></tr>'}</tbody></table>
<p>${input.entries.length} of ${input.total} shown. The same data as JSON: <a href="/api/curvesets">/api/curvesets</a>; the whole library as JSON Lines: <a href="/api/library/export">/api/library/export</a>.</p>
</body></html>`;
}
