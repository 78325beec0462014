/** Words used on several screens, in one place so that they read the same everywhere. */
import type { Quantity } from '../../model/curveset.ts';
import { fromSI, labelOf, showNumber, tokensOf, type CurveUnits, type Unit, type UnitChoice } from '../../units/index.ts';
import type { Step } from '../store/store.ts';

export const STEP_TITLES: Record<Step, string> = {
  load: 'Load the sheet',
  axes: 'Set the axes',
  trace: 'Trace the curves',
  review: 'Review',
  save: 'Save',
};

export const QUANTITY_NAMES: Record<Quantity, string> = { head: 'Head', efficiency: 'Efficiency', power: 'Power', npshr: 'NPSHr' };

/** The same names inside a sentence. */
export { QUANTITY_WORDS } from '../../model/curveset.ts';

/** Units offered per axis: every unit src/units knows for the kind. */
export const UNIT_CHOICES: Readonly<Record<'flow' | 'head' | 'power' | 'efficiency' | 'diameter', readonly string[]>> = {
  flow: tokensOf('flow'),
  head: tokensOf('head'),
  power: tokensOf('power'),
  efficiency: ['%'],
  diameter: tokensOf('diameter'),
};

/** The screen label of a unit token ("m3/h" → "m³/h"), from the one unit table. */
export const unitText = labelOf;

export const SAFETY_SENTENCE = 'Results are for preliminary work. Check them against the manufacturer’s certified data and the local codes before selecting a pump.';

/** A number for a field or a table, by the one formatter: `digits` significant figures, or "not available". */
export function num(value: number | null | undefined, digits = 4): string {
  return showNumber(value, digits).text;
}

/** An SI figure shown in `unit`, the number only (the unit stands in the column head), or "not available". */
export function numIn(si: number | null | undefined, unit: Unit, digits = 4): string {
  return showNumber(typeof si === 'number' ? fromSI(si, unit) : si, digits).text;
}

/** A fraction as a percentage number (the "%" stands in the column head), or "not available". */
export function numPercent(fraction: number | null | undefined, digits = 3): string {
  return showNumber(typeof fraction === 'number' ? fraction * 100 : fraction, digits).text;
}

/** The words for a unit choice: "SI units", "US units", or the set's own units named ("its own units (L/s, m, kW, mm)"). */
export function choiceWords(choice: UnitChoice, u: Pick<CurveUnits, 'flow' | 'head' | 'power' | 'diameter'>): string {
  return choice === 'own' ? `its own units (${unitText(u.flow.label)}, ${u.head.label}, ${u.power.label}, ${u.diameter.label})` : `${choice.toUpperCase()} units`;
}

/** "1575 rpm (90 %)": a drawn speed with its share of the rated speed (the pump's `speed_rpm`). */
export function speedWithShare(rpm: number, ratedRpm: number): string {
  return `${num(rpm, 6)} rpm (${num((100 * rpm) / ratedRpm, 3)} %)`;
}

/**
 * A curve's label on screen, as the sheet labels its curves: "250 mm" for an impeller diameter
 * (in `diameterUnit`), "1575 rpm" for a speed, or "1575 rpm (90 %)" when the rated speed is given.
 */
export function curveLabelText(label: { diameter?: number | undefined; speed?: number | undefined }, diameterUnit: string, ratedRpm?: number): string {
  if (label.speed !== undefined) return ratedRpm ? speedWithShare(label.speed, ratedRpm) : `${num(label.speed, 6)} rpm`;
  return `${label.diameter === undefined ? '?' : num(label.diameter)} ${unitText(diameterUnit)}`;
}

/** The sentence shown while the pump's speed is still the starting value (see Draft.speedGiven). */
export function speedNotGiven(rpm: number): string {
  return `The pump's speed, ${rpm} rpm, is only the workbench's starting value: it was neither read from the sheet nor typed. Type the speed printed on the sheet in step 3 (Speed) before you save, since the curve set, its affinity checks and every duty study are at that speed.`;
}
