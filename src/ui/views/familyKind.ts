/**
 * The question the trace step asks before the curves are labelled: is the sheet drawn for
 * several impeller diameters at one speed, or for one impeller at several speeds? Then the list
 * of diameters (in the diameter unit) or of speeds (in rpm, or in % of the rated speed), which
 * the curves are labelled by.
 */
import { h } from '../dom/h.ts';
import type { Bench } from '../app/bench.ts';
import { parseDiameterList, parseSpeedList, setDiameters, setFamilyKind, setSpeeds, setUnits } from '../store/actions/setup.ts';
import { EditError, type Action } from '../store/actions/action.ts';
import type { Draft, FamilyKind } from '../store/draft.ts';
import { targetFor } from '../store/target.ts';
import { speedWithShare, UNIT_CHOICES, unitText } from './words.ts';

/** A speed as shown beside its chip: "1305 rpm (90 %)" on a sheet whose rated speed is 1450 rpm. */
export function speedText(draft: Pick<Draft, 'pump'>, rpm: number): string {
  return speedWithShare(rpm, draft.pump.speed_rpm);
}

/** The unit a curve label is read in on this sheet. */
export function labelUnit(draft: Pick<Draft, 'family' | 'units'>): string {
  return draft.family === 'speed' ? 'rpm' : unitText(draft.units.diameter);
}

export function familyKindFields(bench: Bench): HTMLElement[] {
  const { store } = bench;
  const { draft } = store;
  const retarget = () => store.setSession({ target: targetFor(store.draft, store.session.target.quantity) });
  const choose = (kind: FamilyKind) => {
    try {
      if (store.dispatch(setFamilyKind(kind))) retarget();
    } catch (error) {
      store.say((error as EditError).message, 'error');
    }
  };
  const question = h('div', { class: 'field' },
    h('span', { class: 'label', id: 'family-kind-label' }, 'The curves are drawn for'),
    h('div', { class: 'segmented small', role: 'group', 'aria-labelledby': 'family-kind-label', id: 'family-kind' },
      h('button', { type: 'button', id: 'family-diameters', 'aria-pressed': draft.family === 'speed' ? 'false' : 'true', onclick: () => choose('diameter') }, 'impeller diameters (one speed)'),
      h('button', { type: 'button', id: 'family-speeds', 'aria-pressed': draft.family === 'speed' ? 'true' : 'false', onclick: () => choose('speed') }, 'speeds (one impeller)')));
  /** A text field holding the family's list; a typed list is read, set and the next curve proposed. */
  const listField = (id: string, value: readonly number[], placeholder: string, set: (text: string) => Action) =>
    h('input', {
      id,
      type: 'text',
      value: value.join(' '),
      placeholder,
      onchange: (e: Event) => {
        try {
          if (store.dispatch(set((e.target as HTMLInputElement).value))) retarget();
        } catch (error) {
          store.say((error as EditError).message, 'error');
        }
      },
    });
  if (draft.family === 'speed') {
    const speeds = listField('speeds', draft.speeds, 'e.g. 1450 1200 950, or 100 90 80 70 %', (text) => setSpeeds(parseSpeedList(text, store.draft.pump.speed_rpm)));
    return [question, h('div', { class: 'field' }, h('label', { for: 'speeds' }, 'Speeds'), speeds,
      h('span', { class: 'unit' }, `rpm, or % of the rated ${draft.pump.speed_rpm} rpm`))];
  }
  const diameters = listField('diameters', draft.diameters, 'e.g. 250 235 220 205', (text) => setDiameters(parseDiameterList(text)));
  const unit = h('select', { id: 'diameter-unit', 'aria-label': 'Diameter unit', onchange: (e: Event) => store.dispatch(setUnits({ diameter: (e.target as HTMLSelectElement).value })) },
    UNIT_CHOICES.diameter.map((u) => h('option', { value: u, selected: u === draft.units.diameter }, unitText(u))));
  return [question, h('div', { class: 'field' }, h('label', { for: 'diameters' }, 'Impeller diameters'), diameters, unit)];
}
