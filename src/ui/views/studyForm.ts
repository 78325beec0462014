/**
 * The workbench study form: what the engineer typed, turned into a study (the same study file
 * model and engine `pumpscribe study` runs), typed in the units the review shows (the sheet's
 * own by default: an L/s sheet is typed in L/s and converted into the study's SI units). A blank suction or
 * discharge pipe is replaced by an equivalent loss through the typed duty point, so that a quick
 * duty (flow, head, static head) still gives a system curve: H = Hs + K·v²/2g, K fixed at the duty.
 */
import { parseStudy, type Study, type StudyInput } from '../../model/study.ts';
import { SERVICES, type Service } from '../../duty/cautions.ts';
import { CELSIUS_ZERO, convert, curveUnits, fromSI, parseUnit, presetCurveTokens, presetNamed, readDecimal, toSI, type CurveUnits, type Unit } from '../../units/index.ts';
import { STANDARD_GRAVITY } from '../../units/constants.ts';

export interface StudyOptionForm {
  name: string;
  impeller: 'trim' | 'drawn' | 'given';
  /** Impeller diameter for "given" (or a drawn one), as typed. */
  diameter: string;
  pumps: '1' | '2' | '3';
  control: 'throttle' | 'speed';
  /** Discharge pipe inside diameter overriding the base, as typed (blank: the base pipe). */
  pipe: string;
}

/** What the engineer typed, as typed (numbers in the units the review shows; temperature in °C). */
export interface DutyForm {
  flow: string;
  head: string;
  /** Static head, lowest (and highest) liquid levels. */
  staticHead: string;
  staticHigh: string;
  service: Service;
  temperatureC: string;
  elevation: string;
  suctionStatic: string;
  /** Suction loss at the duty, used only when no suction pipe is given. */
  suctionLoss: string;
  suctionDiameter: string;
  suctionLength: string;
  suctionK: string;
  dischargeDiameter: string;
  dischargeLength: string;
  dischargeK: string;
  roughness: string;
  hours: string;
  tariff: string;
  motorEfficiency: string;
  options: StudyOptionForm[];
}

export const FIRST_OPTION: StudyOptionForm = { name: 'Trimmed to the duty', impeller: 'trim', diameter: '', pumps: '1', control: 'throttle', pipe: '' };

/** The first option on a speed family (one impeller drawn at several speeds): no trim to offer, the drive finds the speed. */
export const SPEED_FIRST_OPTION: StudyOptionForm = { name: 'Variable speed', impeller: 'drawn', diameter: '', pumps: '1', control: 'speed', pipe: '' };

/** Which kind of family the form studies: impeller diameters at one speed, or one impeller at several speeds. */
export type FormFamily = 'diameter' | 'speed';

export const EMPTY_DUTY: DutyForm = {
  flow: '', head: '', staticHead: '', staticHigh: '', service: 'general', temperatureC: '', elevation: '', suctionStatic: '', suctionLoss: '',
  suctionDiameter: '', suctionLength: '', suctionK: '', dischargeDiameter: '', dischargeLength: '', dischargeK: '', roughness: '',
  hours: '6000', tariff: '0.15', motorEfficiency: '94', options: [FIRST_OPTION],
};

/**
 * The options the form works out: those typed, or while the form is untouched its family's first
 * option — a trim to the duty on a diameter family, variable speed on a speed family, which has
 * no impeller trim to offer.
 */
export function formOptions(form: Pick<DutyForm, 'options'>, family: FormFamily = 'diameter'): StudyOptionForm[] {
  const first = family === 'speed' ? SPEED_FIRST_OPTION : FIRST_OPTION;
  if (form.options.length === 0 || form.options === EMPTY_DUTY.options) return [first];
  return form.options;
}

/** The next option a click adds: each click offers another alternative to compare (never a trim on a speed family). */
export function nextOption(options: readonly StudyOptionForm[], family: FormFamily = 'diameter'): StudyOptionForm {
  const kinds: Array<Omit<StudyOptionForm, 'name'>> = family === 'speed'
    ? [
        { impeller: 'drawn', diameter: '', pumps: '1', control: 'throttle', pipe: '' },
        { impeller: 'drawn', diameter: '', pumps: '2', control: 'speed', pipe: '' },
        { impeller: 'drawn', diameter: '', pumps: '1', control: 'speed', pipe: '' },
      ]
    : [
        { impeller: 'drawn', diameter: '', pumps: '1', control: 'throttle', pipe: '' },
        { impeller: 'drawn', diameter: '', pumps: '1', control: 'speed', pipe: '' },
        { impeller: 'trim', diameter: '', pumps: '2', control: 'throttle', pipe: '' },
      ];
  const kind = kinds[(options.length - 1 + kinds.length) % kinds.length] as Omit<StudyOptionForm, 'name'>;
  return { name: `Option ${options.length + 1}`, ...kind };
}

export class FormError extends Error {
  override name = 'FormError';
}

/** A typed field by the one number reader (src/units/readNumber.ts); undefined for a blank field. */
function number(text: string, label: string): number | undefined {
  return text.trim() === '' ? undefined : readDecimal(text, label);
}

/** The units the form is typed in: those the review shows (flow, head and lengths, diameters). */
export type FormUnits = Pick<CurveUnits, 'flow' | 'head' | 'diameter'>;

/**
 * The study system the form's numbers are written into: the preset whose flow, head and diameter
 * units are the ones shown (so its numbers pass as typed), else SI, into which they are converted.
 */
export function studySystemOf(shown: FormUnits): 'si' | 'us' {
  const us = presetCurveTokens('us');
  return shown.flow.token === us.flow && shown.head.token === us.head && shown.diameter.token === us.diameter ? 'us' : 'si';
}

/** A typed value in the shown unit, in the study's unit (unchanged when they are the same unit). */
const into = (from: Unit, to: Unit) => (v: number | undefined): number | undefined => (v === undefined || from.token === to.token ? v : convert(v, from, to));

/**
 * The study for the form, or null while the duty flow is blank. Throws FormError (one sentence)
 * for a field that is not a number or a duty head below the static head.
 */
export function studyOfForm(form: DutyForm, typedIn: FormUnits | 'si' | 'us', family: FormFamily = 'diameter'): Study | null {
  const shown = typeof typedIn === 'string' ? curveUnits(presetCurveTokens(typedIn)) : typedIn;
  const system = studySystemOf(shown);
  const units = presetNamed(system);
  const flowU = parseUnit('flow', units.flow);
  const headU = parseUnit('head', units.head);
  const diaU = parseUnit('diameter', units.diameter);
  const flowIn = into(shown.flow, flowU);
  const lengthIn = into(shown.head, headU);
  const diameterIn = into(shown.diameter, diaU);
  const flow = flowIn(number(form.flow, 'Duty flow'));
  if (flow === undefined) return null;
  if (!SERVICES.includes(form.service)) throw new FormError(`Unknown service "${form.service}".`);
  const head = lengthIn(number(form.head, 'Duty head'));
  const sLow = lengthIn(number(form.staticHead, 'Static head')) ?? 0;
  const sHigh = lengthIn(number(form.staticHigh, 'Highest static head')) ?? sLow;
  const tC = number(form.temperatureC, 'Liquid temperature') ?? 20;
  const tUnit = parseUnit('temperature', units.temperature);
  const temperature = fromSI(tC + CELSIUS_ZERO, tUnit);
  const roughness = diameterIn(number(form.roughness, 'Roughness')) ?? (system === 'us' ? 0.045 / 25.4 : 0.045);
  const qSI = toSI(flow, flowU);
  /** An equivalent K-only run (length 0, nominal diameter) losing `loss` [study head unit] at flow q [m³/s]. */
  const equivalent = (loss: number, q: number) => {
    const dNominal = system === 'us' ? 4 : 100;
    const dSI = toSI(dNominal, diaU);
    const v = (4 * q) / (Math.PI * dSI * dSI);
    return { name: 'equivalent loss through the typed duty', diameter: dNominal, length: 0, roughness: 0, k: (toSI(loss, headU) * 2 * STANDARD_GRAVITY) / (v * v) };
  };
  const pipe = (d: string, l: string, k: string, what: string) => {
    const dv = diameterIn(number(d, `${what} pipe diameter`));
    const lv = lengthIn(number(l, `${what} pipe length`));
    if (dv === undefined || lv === undefined) return undefined;
    return { diameter: dv, length: lv, roughness, k: number(k, `${what} fittings K`) ?? 0 };
  };
  const suctionPipe = pipe(form.suctionDiameter, form.suctionLength, form.suctionK, 'Suction');
  const suctionLoss = lengthIn(number(form.suctionLoss, 'Suction loss')) ?? 0;
  const dischargePipe = pipe(form.dischargeDiameter, form.dischargeLength, form.dischargeK, 'Discharge');
  let discharge: StudyInput['discharge']['pipes'] = dischargePipe ? [dischargePipe] : [];
  if (!dischargePipe && head !== undefined) {
    if (head < sHigh) throw new FormError('The duty head lies below the static head; the duty head must include the static head, so check both values.');
    if (head > sHigh) discharge = [equivalent(head - sHigh - (suctionPipe ? 0 : suctionLoss), qSI)];
  }
  const chosen = formOptions(form, family);
  const options = chosen.map((o, i) => {
    const name = o.name.trim() || `Option ${i + 1}`;
    const diameter = diameterIn(number(o.diameter, `${name}: impeller diameter`));
    const pipeD = diameterIn(number(o.pipe, `${name}: discharge pipe diameter`));
    const base = dischargePipe ?? discharge[0];
    return {
      name,
      impeller: o.impeller,
      ...(diameter !== undefined && o.impeller !== 'trim' ? { diameter } : {}),
      pumps: Number(o.pumps),
      control: o.control,
      ...(pipeD !== undefined && base ? { discharge: { pipes: [{ ...base, diameter: pipeD }] } } : {}),
    };
  });
  const elevation = lengthIn(number(form.elevation, 'Site elevation'));
  const input: StudyInput = {
    units: system,
    liquid: { temperature },
    site: elevation !== undefined ? { elevation } : {},
    duty: { flow, ...(head !== undefined ? { head } : {}) },
    suction: { surface_above_eye: lengthIn(number(form.suctionStatic, 'Suction static head')) ?? 0, pipes: suctionPipe ? [suctionPipe] : suctionLoss > 0 ? [equivalent(suctionLoss, qSI / Number(chosen[0]?.pumps ?? 1))] : [] },
    discharge: { static_head: [sLow, sHigh], pipes: discharge },
    curveset: 'this sheet',
    options: options as StudyInput['options'],
    operation: {
      hours_per_year: number(form.hours, 'Running hours') ?? 0,
      ...(number(form.tariff, 'Tariff') !== undefined ? { tariff: number(form.tariff, 'Tariff') } : {}),
      motor_efficiency: number(form.motorEfficiency, 'Motor efficiency') ?? 94,
    },
  };
  return parseStudy(input);
}
