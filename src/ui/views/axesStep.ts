/**
 * Step 2: panels and their anchors. Each panel shows its axes (unit, linear or log), its
 * anchors with a value field each, and the calibration residual as it stands.
 */
import { h } from '../dom/h.ts';
import type { Bench, CalibrationState } from '../app/bench.ts';
import type { Quantity } from '../../model/curveset.ts';
import { removeAnchor, removePanel, setAnchorValue, setAxisScale, setAxisUnit, setPanelPlots } from '../store/actions/panels.ts';
import { axisUnits, anchorAxis, type PanelDraft } from '../store/draft.ts';
import { setSheetUnits, SHEET_UNIT_SYSTEMS } from '../store/actions/setup.ts';
import { typedNumber } from '../store/actions/action.ts';
import { unitSystemOf } from '../store/store.ts';
import { QUANTITY_NAMES, UNIT_CHOICES, num, unitText } from './words.ts';
import { detectBox, originTag } from './detectBox.ts';

const QUANTITIES: Quantity[] = ['head', 'efficiency', 'power', 'npshr'];

export function axesStep(bench: Bench): HTMLElement {
  const { store } = bench;
  const { draft, session } = store;
  const chooser = h('div', { class: 'segmented', role: 'group', 'aria-label': 'What the new panel plots' },
    QUANTITIES.map((q) => h('button', {
      type: 'button',
      'aria-pressed': session.drawingFrame && session.framePlots === q ? 'true' : 'false',
      'data-key': `plots-${q}`,
      onclick: () => bench.startFrame(q),
    }, QUANTITY_NAMES[q])));
  return h('div', { class: 'step-body' },
    draft.sheet ? null : h('p', { class: 'hint' }, 'Load a sheet first.'),
    sheetUnits(bench),
    detectBox(bench),
    h('p', { class: 'hint' }, 'For each plot on the sheet: choose what it shows, then drag its frame from corner to corner. The corners become anchors; type the axis values there.'),
    h('div', { class: 'row' }, h('span', { class: 'label' }, 'New panel:'), chooser),
    draft.panels.map((p) => panelCard(bench, p, bench.derived.calibrations.get(p.id))),
  );
}

function axisControls(bench: Bench, panel: PanelDraft, axis: 'x' | 'y'): HTMLElement {
  const { store } = bench;
  const kind = axis === 'x' ? 'flow' : panel.plots === 'efficiency' ? 'efficiency' : panel.plots === 'power' ? 'power' : 'head';
  const choices: readonly string[] = UNIT_CHOICES[kind];
  const unitId = `${panel.id}-${axis}-unit`;
  const scaleId = `${panel.id}-${axis}-scale`;
  const name = axis === 'x' ? 'Flow axis (x)' : `${QUANTITY_NAMES[panel.plots]} axis (y)`;
  return h('div', { class: 'axis-row' },
    h('span', { class: 'label' }, name),
    h('label', { for: unitId, class: 'visually-hidden' }, `${name} unit`),
    h('select', { id: unitId, onchange: (e: Event) => store.dispatch(setAxisUnit(panel.id, axis, (e.target as HTMLSelectElement).value)) },
      (choices.includes(axisUnits(store.draft.units, panel)[axis]) ? choices : [axisUnits(store.draft.units, panel)[axis], ...choices]).map((u) => h('option', { value: u, selected: u === axisUnits(store.draft.units, panel)[axis] }, unitText(u)))),
    h('label', { for: scaleId, class: 'visually-hidden' }, `${name} scale`),
    h('select', { id: scaleId, onchange: (e: Event) => store.dispatch(setAxisScale(panel.id, axis, (e.target as HTMLSelectElement).value as 'linear' | 'log')) },
      h('option', { value: 'linear', selected: panel[`${axis}_scale`] === 'linear' }, 'linear'),
      h('option', { value: 'log', selected: panel[`${axis}_scale`] === 'log' }, 'log')));
}

function residualLine(state: CalibrationState | undefined, panel: PanelDraft): HTMLElement {
  if (!state) return h('p', { class: 'cal pending' }, 'Calibration: waiting for anchor values.');
  if (!state.ok) return h('p', { class: 'cal bad', role: 'status' }, state.reason);
  const c = state.calibration;
  const tone = c.maxPercentOfSpan > 0.3 || c.residualKind === 'none' || c.residualKind === 'estimated' ? 'warn' : 'good';
  const kind = { fit: 'expected over the plot', 'leave-one-out': 'expected over the plot, each anchor checked left out', estimated: 'expected over the plot, cannot be checked', none: 'expected over the plot, cannot be checked' }[c.residualKind] +
    (panel.anchor_bias ? `, including a placement error of ${num(panel.anchor_bias, 2)} sheet units that the found anchors may share` : '');
  return h('p', { class: `cal ${tone}`, role: 'status' },
    `${c.projection === 'projective' ? 'Projective' : 'Affine'} map. Residual ${num(c.maxPercentOfSpan, 2)} % of span (${kind}), ${num(c.maxSheet, 2)} sheet units`,
    c.warnings.length ? h('span', { class: 'cal-warn' }, ` — ${c.warnings[0]}`) : tone === 'good' ? ' — good' : '');
}

function panelCard(bench: Bench, panel: PanelDraft, cal: CalibrationState | undefined): HTMLElement {
  const { store } = bench;
  const active = store.session.activePanel === panel.id;
  return h('section', { class: `card panel-card${active ? ' active' : ''}`, 'data-key': `panel-${panel.id}`, 'aria-label': `${QUANTITY_NAMES[panel.plots]} panel` },
    h('header', null,
      h('button', { type: 'button', class: 'link', onclick: () => bench.selectPanel(panel.id), 'aria-expanded': active ? 'true' : 'false' }, `${QUANTITY_NAMES[panel.plots]} panel`),
      h('span', { class: 'panel-id' }, panel.id),
      originTag(panel)),
    residualLine(cal, panel),
    proposalBox(bench, panel),
    active ? [
      h('div', { class: 'axis-row' },
        h('label', { for: `${panel.id}-plots`, class: 'label' }, 'This panel plots'),
        h('select', { id: `${panel.id}-plots`, onchange: (e: Event) => store.dispatch(setPanelPlots(panel.id, (e.target as HTMLSelectElement).value as Quantity)) },
          QUANTITIES.map((q) => h('option', { value: q, selected: q === panel.plots }, QUANTITY_NAMES[q])))),
      axisControls(bench, panel, 'x'),
      axisControls(bench, panel, 'y'),
      h('table', { class: 'anchors' },
        h('caption', { class: 'visually-hidden' }, 'Anchors of the panel'),
        h('thead', null, h('tr', null, h('th', { scope: 'col' }, 'Anchor'), h('th', { scope: 'col' }, 'Value'), h('th', { scope: 'col' }, h('span', { class: 'visually-hidden' }, 'Remove')))),
        h('tbody', null, panel.anchors.map((a, i) => {
          const axis = anchorAxis(a);
          const id = `anchor-${panel.id}-${i}`;
          const value = a[axis];
          const r = cal?.ok ? cal.calibration.residuals : null;
          return h('tr', { 'data-key': `${panel.id}-a${i}` },
            h('th', { scope: 'row' }, h('label', { for: id }, `${i + 1}. ${a.label && a.label !== axis ? a.label : `${axis} axis`}`)),
            h('td', null,
              h('input', {
                id,
                class: 'anchor-value',
                type: 'text',
                inputmode: 'decimal',
                value: value === undefined ? '' : String(value),
                placeholder: 'value',
                'aria-invalid': value === undefined ? 'true' : 'false',
                onchange: (e: Event) => {
                  const text = (e.target as HTMLInputElement).value.trim();
                  store.dispatch(text === '' ? setAnchorValue(panel.id, i, axis, undefined) : typedNumber(text, `The ${axis} value of anchor ${i + 1}`, (v) => setAnchorValue(panel.id, i, axis, v)));
                },
              }),
              h('span', { class: 'unit' }, unitText(axisUnits(store.draft.units, panel)[axis]))),
            h('td', null, h('button', { type: 'button', class: 'icon', title: 'Remove this anchor', 'aria-label': `Remove anchor ${i + 1}`, onclick: () => store.dispatch(removeAnchor(panel.id, i)) }, '×'),
              r && r[anchorIndexAmongValued(panel, i)] !== undefined ? h('span', { class: 'anchor-res' }, `${num(r[anchorIndexAmongValued(panel, i)]?.percentOfSpan ?? 0, 2)} %`) : null));
        }))),
      h('p', { class: 'hint' }, 'Drag an anchor onto a labelled tick to use another value; click on a labelled tick to add one.'),
      h('button', { type: 'button', class: 'danger', onclick: () => store.dispatch(removePanel(panel.id)) }, 'Delete this panel and its traces'),
    ] : null,
  );
}

/**
 * Calibration residuals list the anchors it used, x-axis anchors first then y-axis anchors
 * for the two-axes method, or all in order for the affine one. This finds the entry of anchor i.
 */
function anchorIndexAmongValued(panel: PanelDraft, i: number): number {
  const valued = panel.anchors.map((a, k) => ({ a, k })).filter(({ a }) => a.x !== undefined || a.y !== undefined);
  const both = valued.every(({ a }) => a.x !== undefined && a.y !== undefined);
  const order = both ? valued : [...valued.filter(({ a }) => a.y === undefined), ...valued.filter(({ a }) => a.x === undefined)];
  return order.findIndex(({ k }) => k === i);
}

function proposalBox(bench: Bench, panel: PanelDraft): HTMLElement | null {
  const p = bench.proposalFor(panel.id);
  if (!p) return null;
  const xs = p.anchors.flatMap((a) => (a.x !== undefined ? [a.x] : []));
  const ys = p.anchors.flatMap((a) => (a.y !== undefined ? [a.y] : []));
  const range = (v: number[]) => `${num(Math.min(...v))} … ${num(Math.max(...v))}`;
  return h('div', { class: 'proposal', role: 'group', 'aria-label': 'Anchors read from the sheet' },
    h('p', null, `Read from the sheet's text: flow ${range(xs)} ${unitText(axisUnits(bench.store.draft.units, panel).x)} (${xs.length} labels, ${p.xScale}), ${QUANTITY_NAMES[panel.plots].toLowerCase()} ${range(ys)} ${unitText(axisUnits(bench.store.draft.units, panel).y)} (${ys.length} labels, ${p.yScale}); residual ${num(p.residual, 2)} % of span.`),
    h('button', { type: 'button', class: 'primary', id: `use-proposal-${panel.id}`, onclick: () => bench.useProposal(panel.id) }, 'Use the proposed anchors'));
}

/** The units the sheet is drawn in, chosen at once for every axis (each axis can still differ). */
function sheetUnits(bench: Bench): HTMLElement {
  const { store } = bench;
  const { draft } = store;
  return h('div', { class: 'sheet-units' },
    h('span', { class: 'label', id: 'sheet-units-label' }, 'Units on the sheet:'),
    h('div', { class: 'segmented small', role: 'group', 'aria-labelledby': 'sheet-units-label' },
      (['si', 'us'] as const).map((sys) => {
        const u = SHEET_UNIT_SYSTEMS[sys];
        const on = (Object.keys(u) as (keyof typeof u)[]).every((k) => draft.units[k] === u[k]);
        return h('button', { type: 'button', 'data-key': `units-${sys}`, 'aria-pressed': on ? 'true' : 'false', title: `flow ${unitText(u.flow)}, head ${u.head}, power ${u.power}, NPSH ${u.npsh}, diameter ${u.diameter}`, onclick: () => { if (store.dispatch(setSheetUnits(u))) store.setSession({ unitSystem: sys }); } }, `${sys.toUpperCase()} (${unitText(u.flow)}, ${u.head}, ${u.power}, ${u.diameter})`);
      })),
    // Any other flow unit the sheet is drawn in (L/s, m³/min, imp gpm…): the review then shows the sheet's own units.
    h('label', { for: 'sheet-flow-unit', class: 'label' }, 'flow in'),
    h('select', { id: 'sheet-flow-unit', onchange: (e: Event) => {
      if (store.dispatch(setSheetUnits({ ...draft.units, flow: (e.target as HTMLSelectElement).value }))) store.setSession({ unitSystem: unitSystemOf(store.draft) });
    } }, UNIT_CHOICES.flow.map((t) => h('option', { value: t, selected: t === draft.units.flow }, unitText(t)))));
}
