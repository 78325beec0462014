/**
 * The library screens, through the library's HTTP API only: search and filter the entries,
 * open one to see its family chart and its revisions, and compare candidates at a duty point
 * (their head curves with the duty, and a table of the figures there).
 *
 * Routes: #/library?q=…&flow=…&head=…&units=si · #/library/<id>[?revision=n] · #/compare?ids=a,b&flow=…&head=…&static=…&units=si
 */
import { h, svg } from '../dom/h.ts';
import type { CurveSet } from '../../model/curveset.ts';
import { toCurveSet } from '../../model/curvesetIO.ts';
import { meetDuty } from '../../duty/meetDuty.ts';
import { PRELIMINARY } from '../../duty/cautions.ts';
import { evaluateUnchecked, linspace } from '../../fit/polynomial.ts';
import { chosenUnits, fromSI, niceLinearScale, NOT_AVAILABLE, presetCurveTokens, readDecimal, toSI, unitChoiceNamed, type UnitChoice } from '../../units/index.ts';
import { familyChart, polylinePoints } from '../views/familyChart.ts';
import { num, numIn, numPercent, unitText } from '../views/words.ts';

/** An entry as GET /api/curvesets lists it (SI figures); the screens read it from the HTTP answers. */
import type { EntryInfo } from '../../model/libraryEntry.ts';

interface Candidate {
  id: string;
  name: string;
  diameter: number | null;
  efficiency: number | null;
  power: number | null;
  npshr: number | null;
  message: string;
  por: { position: string; flow_to_bep_percent: number | null };
}

async function getJson<T>(url: string): Promise<T> {
  const response = await fetch(url, { headers: { accept: 'application/json' } });
  const body = await response.json().catch(() => ({}));
  if (!response.ok) throw new Error((body as { error?: string }).error ?? `The library answered ${response.status}.`);
  return body as T;
}

function params(hash: string): URLSearchParams {
  const q = hash.indexOf('?');
  return new URLSearchParams(q >= 0 ? hash.slice(q + 1) : '');
}

function frame(title: string, ...content: (Node | string | null)[]): HTMLElement {
  return h('div', { class: 'library-page' },
    h('header', { class: 'topbar' },
      h('div', { class: 'brand' }, h('span', { class: 'wordmark' }, 'Pumpscribe'), h('span', { class: 'subtitle' }, 'library')),
      h('div', { class: 'sheet-name' }, title),
      h('div', { class: 'tools' }, h('a', { href: '#/library', class: 'nav' }, 'Library'), h('a', { href: '#/', class: 'nav' }, 'Back to the workbench'))),
    h('main', { class: 'library' }, ...content));
}

export function showLibrary(root: HTMLElement, hash: string, _bench: unknown): void {
  const path = hash.replace(/\?.*$/, '');
  const p = params(hash);
  if (path.startsWith('#/compare')) void showCompare(root, p);
  else if (/^#\/library\/[^/]+$/.test(path)) void showEntry(root, decodeURIComponent(path.slice('#/library/'.length)), p);
  else void showList(root, p);
}

function failure(root: HTMLElement, title: string, error: unknown): void {
  root.replaceChildren(frame(title, h('p', { class: 'cal bad', role: 'alert' }, `The library could not be reached: ${(error as Error).message} Is the server running (npm start)?`)));
}

async function showList(root: HTMLElement, p: URLSearchParams): Promise<void> {
  const q = p.get('q') ?? '';
  // A search spans many curve sets, so it is typed in a preset system (SI unless asked otherwise).
  const units = p.get('units') === 'us' ? 'us' : 'si';
  const flow = p.get('flow') ?? '';
  const head = p.get('head') ?? '';
  const u = chosenUnits(presetCurveTokens(units));
  root.replaceChildren(frame('Library', h('p', { class: 'hint' }, 'Loading…')));
  try {
    const list = await getJson<{ total: number; entries: EntryInfo[] }>(`api/curvesets?limit=500&q=${encodeURIComponent(q)}`);
    const search = flow && head ? await getJson<{ candidates: Candidate[]; notice: string; matched: number; examined: number }>(`api/search?units=${units}&flow=${encodeURIComponent(flow)}&head=${encodeURIComponent(head)}`).catch((e: Error) => ({ error: e.message })) : null;
    const chosen = new Set<string>();
    const compare = h('button', { type: 'button', id: 'compare-selected', class: 'primary', disabled: true, onclick: () => { location.hash = `#/compare?ids=${[...chosen].map(encodeURIComponent).join(',')}&units=${units}${flow ? `&flow=${flow}` : ''}${head ? `&head=${head}` : ''}`; } }, 'Compare the chosen pumps');
    const pick = (id: string, on: boolean) => {
      if (on) chosen.add(id);
      else chosen.delete(id);
      compare.disabled = chosen.size < 1;
      compare.textContent = chosen.size ? `Compare the ${chosen.size} chosen pump${chosen.size === 1 ? '' : 's'}` : 'Compare the chosen pumps';
    };
    const form = h('form', { class: 'library-search', role: 'search', onsubmit: (e: Event) => {
      e.preventDefault();
      const f = new FormData(e.target as HTMLFormElement);
      const next = new URLSearchParams();
      for (const key of ['q', 'flow', 'head', 'units']) { const v = String(f.get(key) ?? '').trim(); if (v) next.set(key, v); }
      location.hash = `#/library?${next}`;
    } },
      h('div', { class: 'field' }, h('label', { for: 'lib-q' }, 'Words'), h('input', { id: 'lib-q', name: 'q', type: 'search', value: q, placeholder: 'name, maker, model, size' })),
      h('div', { class: 'field' }, h('label', { for: 'lib-flow' }, 'Duty flow'), h('input', { id: 'lib-flow', name: 'flow', type: 'text', inputmode: 'decimal', value: flow }), h('span', { class: 'unit' }, unitText(u.flow.label))),
      h('div', { class: 'field' }, h('label', { for: 'lib-head' }, 'Duty head'), h('input', { id: 'lib-head', name: 'head', type: 'text', inputmode: 'decimal', value: head }), h('span', { class: 'unit' }, u.head.label)),
      h('div', { class: 'field' }, h('label', { for: 'lib-units' }, 'Units'), h('select', { id: 'lib-units', name: 'units' }, h('option', { value: 'si', selected: units === 'si' }, 'SI (m³/h, m, kW, mm)'), h('option', { value: 'us', selected: units === 'us' }, 'US (gpm, ft, hp, in)'))),
      h('button', { type: 'submit', class: 'primary' }, 'Search'));
    const duty = search && 'candidates' in search
      ? h('section', { 'aria-label': 'Pumps that can meet the duty' },
          h('h3', null, `Pumps for ${flow} ${unitText(u.flow.label)} at ${head} ${u.head.label}: ${search.matched} of ${search.examined} can meet it`),
          h('table', { class: 'figures' },
            h('thead', null, h('tr', null, h('th', { scope: 'col' }, 'Pump'), h('th', { scope: 'col' }, `Diameter [${u.diameter.label}]`), h('th', { scope: 'col' }, 'Efficiency [%]'), h('th', { scope: 'col' }, `Power [${u.power.label}]`), h('th', { scope: 'col' }, `NPSHr [${u.npsh.label}]`), h('th', { scope: 'col' }, 'Against BEP'))),
            h('tbody', null, search.candidates.map((c) => h('tr', null,
              h('th', { scope: 'row' }, h('a', { href: `#/library/${encodeURIComponent(c.id)}` }, c.name)),
              h('td', null, num(c.diameter)),
              h('td', null, num(c.efficiency, 3)),
              h('td', null, num(c.power)),
              h('td', null, num(c.npshr, 3)),
              h('td', null, c.por.flow_to_bep_percent === null ? c.por.position : `${num(c.por.flow_to_bep_percent, 3)} % of BEP flow (${c.por.position} the POR)`))))),
          h('p', { class: 'caution', role: 'note' }, search.notice))
      : search && 'error' in search ? h('p', { class: 'cal bad', role: 'alert' }, search.error) : null;
    root.replaceChildren(frame(`Library — ${list.total} entr${list.total === 1 ? 'y' : 'ies'}`,
      form,
      duty,
      h('div', { class: 'row' }, compare),
      h('table', { class: 'figures entries' },
        h('caption', null, q ? `Entries matching “${q}”` : 'All entries'),
        h('thead', null, h('tr', null, h('th', { scope: 'col' }, h('span', { class: 'visually-hidden' }, 'Choose')), h('th', { scope: 'col' }, 'Pump'), h('th', { scope: 'col' }, 'Speed [rpm]'), h('th', { scope: 'col' }, `Diameters [${u.diameter.label}]`), h('th', { scope: 'col' }, `Flow [${unitText(u.flow.label)}]`), h('th', { scope: 'col' }, `BEP [${unitText(u.flow.label)} at ${u.head.label}]`), h('th', { scope: 'col' }, 'Revision'))),
        h('tbody', null, list.entries.map((e) => h('tr', { 'data-key': e.id },
          h('td', null, h('input', { type: 'checkbox', 'aria-label': `Choose ${e.name} for comparison`, onchange: (ev: Event) => pick(e.id, (ev.target as HTMLInputElement).checked) })),
          h('th', { scope: 'row' }, h('a', { href: `#/library/${encodeURIComponent(e.id)}` }, e.name), e.maker ? h('span', { class: 'hint' }, ` · ${e.maker}`) : null),
          h('td', null, num(e.speed_rpm)),
          h('td', null, e.family === 'speed' ? 'one impeller drawn at several speeds' : e.diameters_m.map((d) => numIn(d, u.diameter)).join(', ') || NOT_AVAILABLE.text),
          h('td', null, `${numIn(e.flow_range_m3s[0], u.flow)} … ${numIn(e.flow_range_m3s[1], u.flow)}`),
          h('td', null, e.bep ? `${numIn(e.bep.flow_m3s, u.flow)} at ${numIn(e.bep.head_m, u.head)}, ${numPercent(e.bep.efficiency)} %` : NOT_AVAILABLE.text),
          h('td', null, String(e.revision))))))));
  } catch (error) {
    failure(root, 'Library', error);
  }
}

/** The unit choice a page was asked for; the curve set's own units when none (or an unknown word) was given. */
function choiceParam(p: URLSearchParams): UnitChoice {
  try {
    return unitChoiceNamed(p.get('units') ?? undefined) ?? 'own';
  } catch {
    return 'own';
  }
}

const CHOICE_NAMES: Record<UnitChoice, string> = { own: 'its own units', si: 'SI units', us: 'US units' };

async function showEntry(root: HTMLElement, id: string, p: URLSearchParams): Promise<void> {
  const units = choiceParam(p);
  const revision = p.get('revision');
  root.replaceChildren(frame(id, h('p', { class: 'hint' }, 'Loading…')));
  try {
    const [set, revisions] = await Promise.all([
      getJson<unknown>(revision ? `api/curvesets/${encodeURIComponent(id)}/revisions/${encodeURIComponent(revision)}` : `api/curvesets/${encodeURIComponent(id)}`).then((raw) => toCurveSet(raw, 'The stored curve set')),
      getJson<{ revisions: { revision: number; saved_at: string; bytes: number }[] }>(`api/curvesets/${encodeURIComponent(id)}/revisions`),
    ]);
    const latest = Math.max(...revisions.revisions.map((r) => r.revision));
    root.replaceChildren(frame(set.pump.name,
      h('p', null, `${set.pump.name}${set.pump.maker ? `, ${set.pump.maker}` : ''} — ${num(set.speed_rpm)} rpm, ${set.members.length} diameters. Showing revision ${revision ?? latest} of ${latest}.`),
      h('div', { class: 'entry' },
        familyChart(set, units),
        h('section', { 'aria-label': 'Revisions' },
          h('h3', null, 'Revisions'),
          h('ol', { class: 'revisions', reversed: true }, [...revisions.revisions].sort((a, b) => b.revision - a.revision).map((r) =>
            h('li', null, h('a', { href: `#/library/${encodeURIComponent(id)}?revision=${r.revision}&units=${units}`, 'aria-current': String(r.revision) === (revision ?? String(latest)) ? 'true' : undefined }, `Revision ${r.revision}`), ` — saved ${new Date(r.saved_at).toLocaleString()}, ${num(r.bytes / 1024, 3)} kB`))),
          h('h3', null, 'Findings'),
          h('ul', { class: 'plain' }, set.findings.map((f) => h('li', { class: `finding ${f.severity}` }, h('span', { class: 'severity' }, f.severity), h('span', { class: 'finding-text' }, f.message)))),
          h('p', null, (['own', 'si', 'us'] as const).filter((c) => c !== units).flatMap((c, k) => [k ? ' · ' : '', h('a', { href: `#/library/${encodeURIComponent(id)}?${revision ? `revision=${revision}&` : ''}units=${c}` }, `Show in ${CHOICE_NAMES[c]}`)]))))));
  } catch (error) {
    failure(root, id, error);
  }
}

const INKS = ['#1f4fa3', '#a8321f', '#1b7f4b', '#6a3fa0', '#8a5300', '#0d6b6b'];

async function showCompare(root: HTMLElement, p: URLSearchParams): Promise<void> {
  // Several curve sets side by side: a preset system, SI unless asked otherwise.
  const units = p.get('units') === 'us' ? 'us' : 'si';
  const u = chosenUnits(presetCurveTokens(units));
  const ids = (p.get('ids') ?? '').split(',').filter(Boolean);
  const problems: string[] = [];
  const typed = (key: string, field: string): number | undefined => {
    const text = p.get(key);
    if (!text) return undefined;
    try {
      return readDecimal(text, field, { sign: 'positive' });
    } catch (error) {
      problems.push((error as Error).message);
      return undefined;
    }
  };
  const flow = typed('flow', 'The duty flow');
  const head = typed('head', 'The duty head');
  const hasDuty = flow !== undefined && head !== undefined;
  root.replaceChildren(frame('Compare', h('p', { class: 'hint' }, 'Loading…')));
  try {
    const sets = await Promise.all(ids.map((id) => getJson<unknown>(`api/curvesets/${encodeURIComponent(id)}`).then((raw) => ({ id, set: toCurveSet(raw, `The stored curve set ${id}`) }))));
    const duty = hasDuty ? { flow_m3s: toSI(flow, u.flow), head_m: toSI(head, u.head) } : null;
    const problem = problems.length ? h('p', { class: 'cal bad', role: 'alert' }, problems.join(' ')) : null;
    const rows = sets.map(({ id, set }) => ({ id, set, match: duty ? meetDuty(set, duty) : null }));
    root.replaceChildren(frame(`Compare ${sets.length} pump${sets.length === 1 ? '' : 's'}`,
      h('form', { class: 'library-search', onsubmit: (e: Event) => {
        e.preventDefault();
        const f = new FormData(e.target as HTMLFormElement);
        location.hash = `#/compare?ids=${ids.join(',')}&units=${units}&flow=${encodeURIComponent(String(f.get('flow')))}&head=${encodeURIComponent(String(f.get('head')))}`;
      } },
        h('div', { class: 'field' }, h('label', { for: 'cmp-flow' }, 'Duty flow'), h('input', { id: 'cmp-flow', name: 'flow', type: 'text', inputmode: 'decimal', value: p.get('flow') ?? '' }), h('span', { class: 'unit' }, unitText(u.flow.label))),
        h('div', { class: 'field' }, h('label', { for: 'cmp-head' }, 'Duty head'), h('input', { id: 'cmp-head', name: 'head', type: 'text', inputmode: 'decimal', value: p.get('head') ?? '' }), h('span', { class: 'unit' }, u.head.label)),
        h('button', { type: 'submit', class: 'primary' }, 'Compare at this duty')),
      problem,
      compareChart(rows.map((r) => r.set), duty, units),
      h('table', { class: 'figures compare' },
        h('caption', null, duty ? `Figures at ${num(flow)} ${unitText(u.flow.label)} and ${num(head)} ${u.head.label} (impeller trimmed to the duty${rows.some((r) => r.set.family === 'speed') ? '; a pump drawn at several speeds runs at the speed that meets it, without a trim' : ''})` : 'Type a duty to see the figures there'),
        h('thead', null, h('tr', null, h('th', { scope: 'col' }, 'Pump'), h('th', { scope: 'col' }, `Diameter [${u.diameter.label}]`), h('th', { scope: 'col' }, 'Trim [%]'), h('th', { scope: 'col' }, 'Speed [rpm]'), h('th', { scope: 'col' }, 'Efficiency [%]'), h('th', { scope: 'col' }, `Power [${u.power.label}]`), h('th', { scope: 'col' }, `NPSHr [${u.npsh.label}]`), h('th', { scope: 'col' }, 'Against BEP'), h('th', { scope: 'col' }, 'Note'))),
        h('tbody', null, rows.map((r, i) => {
          const m = r.match;
          const pt = m?.point;
          return h('tr', null,
            h('th', { scope: 'row' }, h('span', { class: 'swatch', style: { background: INKS[i % INKS.length] } }), ' ', h('a', { href: `#/library/${encodeURIComponent(r.id)}` }, r.set.pump.name)),
            h('td', null, numIn(m?.diameter_m, u.diameter)),
            h('td', null, numPercent(m?.trim_ratio)),
            h('td', null, num(m?.method === 'speed' ? m.speed_rpm : r.set.speed_rpm)),
            h('td', null, numPercent(pt?.efficiency)),
            h('td', null, numIn(pt?.power_W, u.power)),
            h('td', null, numIn(pt?.npshr_m, u.npsh, 3)),
            h('td', null, pt?.flow_to_bep !== undefined ? `${numPercent(pt.flow_to_bep)} % (${pt.por_position})` : NOT_AVAILABLE.text),
            h('td', { class: m && m.status !== 'meets' ? 'warn' : '' }, m ? (pt?.extrapolated.length ? `${m.message} Some figures are extrapolated.` : m.message) : ''));
        }))),
      h('p', { class: 'caution', role: 'note' }, PRELIMINARY)));
  } catch (error) {
    failure(root, 'Compare', error);
  }
}

/** The head curves of every candidate (each diameter, thin; the largest, bold) with the duty point. */
function compareChart(sets: CurveSet[], duty: { flow_m3s: number; head_m: number } | null, units: 'si' | 'us'): SVGElement {
  const u = chosenUnits(presetCurveTokens(units));
  const [W, H, L, B] = [640, 360, 60, 40];
  const curves = sets.flatMap((s, i) => s.members.flatMap((m, k) => (m.curves.head?.fit ? [{ i, k, fit: m.curves.head.fit }] : [])));
  const qMax = Math.max(duty?.flow_m3s ?? 0, ...curves.map((c) => c.fit.domain[1]));
  const hMax = Math.max(duty?.head_m ?? 0, ...curves.map((c) => evaluateUnchecked(c.fit, c.fit.domain[0])));
  const xs = niceLinearScale(0, fromSI(qMax, u.flow), [L, W - 20], 6);
  // The plot starts 26 px down: the head axis title sits above it, clear of the top tick label.
  const TOP = 26;
  const ys = niceLinearScale(0, fromSI(hMax, u.head), [H - B, TOP], 5);
  const x = (q: number) => xs.map(fromSI(q, u.flow));
  const y = (v: number) => ys.map(fromSI(v, u.head));
  const chart = svg('svg', { viewBox: `0 0 ${W} ${H}`, class: 'family-chart compare-chart', role: 'img', 'aria-label': `Head curves of ${sets.length} pumps${duty ? ' with the duty point' : ''}` });
  for (const t of xs.tickValues) chart.append(svg('line', { x1: xs.map(t), x2: xs.map(t), y1: TOP, y2: H - B, class: 'grid' }), svg('text', { x: xs.map(t), y: H - B + 14, class: 'tick', 'text-anchor': 'middle' }, num(t)));
  for (const t of ys.tickValues) chart.append(svg('line', { x1: L, x2: W - 20, y1: ys.map(t), y2: ys.map(t), class: 'grid' }), svg('text', { x: L - 6, y: ys.map(t) + 4, class: 'tick', 'text-anchor': 'end' }, num(t)));
  for (const c of curves) {
    const pts = polylinePoints(linspace(c.fit.domain[0], c.fit.domain[1], 50).map((q) => [x(q), y(evaluateUnchecked(c.fit, q))] as const));
    chart.append(svg('polyline', { points: pts, class: 'curve', stroke: INKS[c.i % INKS.length], 'stroke-width': c.k === 0 ? 2.2 : 1, fill: 'none' }));
  }
  if (duty) chart.append(svg('rect', { x: x(duty.flow_m3s) - 5, y: y(duty.head_m) - 5, width: 10, height: 10, class: 'op-point' }, svg('title', null, 'Duty point')));
  chart.append(svg('text', { x: L + (W - L) / 2, y: H - 6, class: 'axis-title', 'text-anchor': 'middle' }, `Flow [${unitText(u.flow.label)}]`), svg('text', { x: L, y: TOP - 9, class: 'axis-title' }, `Head [${u.head.label}]`));
  return chart;
}
