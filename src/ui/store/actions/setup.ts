/** Edits of the sheet reference, the pump, the units, the kind of family and its diameter or speed list. */
import { CURVE_UNIT_KIND, isDecimalText, parseUnit, presetCurveTokens, readDecimal } from '../../../units/index.ts';
import { EMPTY_DRAFT, familyOfTraces, npshUnit, powerUnit, type Draft, type FamilyKind, type PumpDraft, type SheetRef, type UnitsDraft } from '../draft.ts';
import { edited, EditError, requirePositive, type Action } from './action.ts';

/**
 * The record a new sheet starts: a new take-off of its own. Nothing of the previous pump (name,
 * speed, diameters, panels, traces) carries over; only the units chosen last, as a preference.
 */
export function newSheetDraft(sheet: SheetRef, pumpName: string, previous: Draft = EMPTY_DRAFT): Draft {
  return {
    ...EMPTY_DRAFT,
    units: previous.units,
    sheet,
    ...(sheet.sha256 ? { sheet_sha256: sheet.sha256 } : {}),
    pump: { ...EMPTY_DRAFT.pump, name: pumpName },
  };
}

/** Another page of the same file: the panels drawn on the old page no longer fit. */
export const choosePage = (page: number, width: number, height: number): Action => (draft) => {
  if (!draft.sheet) throw new EditError('Load a sheet before choosing a page.');
  if (!Number.isInteger(page) || page < 1 || page > draft.sheet.pageCount) throw new EditError(`Page ${page} does not exist; the sheet has ${draft.sheet.pageCount}.`);
  if (page === draft.sheet.page && draft.sheet.width === width) return null;
  return edited({ ...draft, sheet: { ...draft.sheet, page, width, height }, panels: [], traces: [] }, `choose page ${page}`);
};

/** Records the checksum once the file has been hashed; not an edit the user made. */
export const recordChecksum = (sha256: string): Action => (draft) => {
  if (!draft.sheet || draft.sheet.sha256 === sha256) return null;
  return { draft: { ...draft, sheet: { ...draft.sheet, sha256 } }, label: 'checksum', undoable: false };
};

export const setPump = (patch: Partial<PumpDraft>): Action => (draft) => {
  if (patch.speed_rpm !== undefined) requirePositive(patch.speed_rpm, 'The speed');
  if (patch.specific_gravity !== undefined) requirePositive(patch.specific_gravity, 'The specific gravity');
  const pump = { ...draft.pump, ...patch };
  // Typing the speed vouches for it, also when it equals the starting value.
  const given = patch.speed_rpm !== undefined && !draft.speedGiven;
  if (JSON.stringify(pump) === JSON.stringify(draft.pump) && !given) return null;
  const what = Object.keys(patch).map((k) => k.replace('_rpm', '').replace('_', ' ')).join(', ');
  return edited({ ...draft, pump, ...(given ? { speedGiven: true } : {}) }, `set pump ${what}`);
};

export const setUnits = (patch: Partial<UnitsDraft>): Action => (draft) => {
  const canonical: Partial<Record<keyof UnitsDraft, string>> = {};
  for (const [key, token] of Object.entries(patch) as [keyof UnitsDraft, string][]) {
    try {
      canonical[key] = parseUnit(CURVE_UNIT_KIND[key], token).token;
    } catch (error) {
      throw new EditError((error as Error).message);
    }
  }
  const units = { ...draft.units, ...canonical };
  if (JSON.stringify(units) === JSON.stringify(draft.units)) return null;
  return edited({ ...draft, units }, 'change units');
};

/** Diameters typed as one list ("250 235 220 205" or "250, 235"), kept largest first. */
export function parseDiameterList(text: string): number[] {
  const parts = text.split(/[\s,;]+/).filter(Boolean);
  const values = parts.map((p) => (isDecimalText(p) ? readDecimal(p, 'A diameter') : Number.NaN));
  const bad = parts.find((_, i) => !((values[i] as number) > 0));
  if (bad !== undefined) throw new EditError(`"${bad}" is not a diameter; type the diameters as numbers separated by spaces, e.g. 250 235 220 205.`);
  return [...new Set(values)].sort((a, b) => b - a);
}

export const setDiameters = (diameters: readonly number[]): Action => (draft) => {
  for (const d of diameters) requirePositive(d, 'Each diameter');
  const next = [...new Set(diameters)].sort((a, b) => b - a);
  if (next.join() === draft.diameters.join()) return null;
  return edited({ ...draft, diameters: next }, 'set diameters');
};

/**
 * Speeds typed as one list, in rpm ("1450 1200 950") or in % of the rated speed ("100 90 80 70 %",
 * "100% 90%"), returned in rpm, fastest first. A percent list needs the rated speed `rated_rpm`.
 */
export function parseSpeedList(text: string, rated_rpm: number): number[] {
  const percent = text.includes('%');
  const parts = text.replace(/%|rpm|min-1|1\/min/gi, ' ').split(/[\s,;]+/).filter(Boolean);
  const values = parts.map((p) => (isDecimalText(p) ? readDecimal(p, 'A speed') : Number.NaN));
  const bad = parts.find((_, i) => !(Number.isFinite(values[i]) && (values[i] as number) > 0));
  if (bad !== undefined || parts.length === 0) throw new EditError(`"${bad ?? text.trim()}" is not a speed; type the speeds in rpm (e.g. 1450 1200 950) or in % of the rated speed (e.g. 100 90 80 70 %).`);
  if (percent && !(rated_rpm > 0)) throw new EditError('Type the rated speed first: speeds in % are a share of it.');
  if (percent && values.some((v) => v > 200)) throw new EditError('A speed in % of the rated speed is at most 200 %; type speeds above that in rpm.');
  const rpm = values.map((v) => (percent ? Math.round(v * rated_rpm * 10) / 1000 : v));
  return [...new Set(rpm)].sort((a, b) => b - a);
}

export const setSpeeds = (speeds: readonly number[]): Action => (draft) => {
  for (const n of speeds) requirePositive(n, 'Each speed');
  const next = [...new Set(speeds)].sort((a, b) => b - a);
  if (next.join() === draft.speeds.join()) return null;
  return edited({ ...draft, speeds: next }, 'set speeds');
};

/**
 * Which kind of sheet it is: impeller diameters at one speed, or one impeller at several speeds.
 * Refused while traces are labelled by the other kind, so that no curve changes meaning silently.
 */
export const setFamilyKind = (family: FamilyKind): Action => (draft) => {
  if (family === draft.family) return null;
  const labelled = familyOfTraces(draft.traces);
  if (labelled !== undefined && labelled !== family) {
    const count = draft.traces.filter((t) => (labelled === 'speed' ? t.speed : t.diameter) !== undefined).length;
    throw new EditError(`${count} trace${count === 1 ? ' is' : 's are'} labelled by ${labelled} already; relabel or delete ${count === 1 ? 'it' : 'them'} before calling this sheet a family of ${family === 'speed' ? 'speeds' : 'impeller diameters'}.`);
  }
  return edited({ ...draft, family }, family === 'speed' ? 'sheet of one impeller at several speeds' : 'sheet of impeller diameters');
};

/** Details read from the sheet's text (speed, diameters, units), taken in one undoable step. */
export const readFromSheet = (found: { speed_rpm?: number; diameters?: readonly number[]; units?: Partial<UnitsDraft> }): Action => (draft) => {
  let next = draft;
  if (found.speed_rpm !== undefined) next = { ...next, pump: { ...next.pump, speed_rpm: requirePositive(found.speed_rpm, 'The speed') }, speedGiven: true };
  if (found.units) {
    const canonical: Partial<Record<keyof UnitsDraft, string>> = {};
    for (const [key, token] of Object.entries(found.units) as [keyof UnitsDraft, string | undefined][]) {
      if (token === undefined) continue;
      try {
        canonical[key] = parseUnit(CURVE_UNIT_KIND[key], token).token;
      } catch {
        // A unit the sheet names but the tables do not know is left for the engineer to choose.
      }
    }
    next = { ...next, units: { ...next.units, ...canonical } };
  }
  if (found.diameters?.length && next.diameters.length === 0) next = { ...next, diameters: [...new Set(found.diameters)].sort((a, b) => b - a) };
  if (next === draft || JSON.stringify(next) === JSON.stringify(draft)) return null;
  return edited(next, 'read details from the sheet');
};

/** The unit presets of the trade, as the sheet may be drawn in them. */
const sheetUnitsOf = (name: 'si' | 'us'): UnitsDraft => {
  const p = presetCurveTokens(name);
  return { flow: p.flow, head: p.head, power: p.power, npsh: p.npsh, diameter: p.diameter };
};
export const SHEET_UNIT_SYSTEMS: Record<'si' | 'us', UnitsDraft> = { si: sheetUnitsOf('si'), us: sheetUnitsOf('us') };

/**
 * The units the whole sheet is drawn in: the draft's units, and the axes of the panels
 * drawn so far that still use the units of the previous choice.
 */
export const setSheetUnits = (units: UnitsDraft): Action => (draft) => {
  const old = draft.units;
  const swap = (token: string, pairs: [string, string][]) => pairs.find(([from]) => from === token)?.[1] ?? token;
  const panels = draft.panels.map((p) => {
    // A panel without units of its own follows the record's units; one with its own units
    // changes along where they were the old choice.
    if (!p.units) return p;
    const own = p.units;
    const y = own.y === undefined ? undefined : p.plots === 'head' ? swap(own.y, [[old.head, units.head]]) : p.plots === 'npshr' ? swap(own.y, [[npshUnit(old), npshUnit(units)]]) : p.plots === 'power' ? swap(own.y, [[powerUnit(old), powerUnit(units)]]) : own.y;
    const x = own.x === undefined ? undefined : swap(own.x, [[old.flow, units.flow]]);
    return { ...p, units: { ...(x !== undefined ? { x } : {}), ...(y !== undefined ? { y } : {}) } };
  });
  if (JSON.stringify(units) === JSON.stringify(old) && JSON.stringify(panels) === JSON.stringify(draft.panels)) return null;
  return edited({ ...draft, units: { ...units }, panels }, 'change the units of the sheet');
};
