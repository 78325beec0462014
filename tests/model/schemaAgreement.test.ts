/**
 * The published curve-set schema and our reader agree: ajv 8 (an independent validator,
 * JSON Schema draft 2020-12) and `toCurveSet` give the same verdict on every file of a seeded
 * corpus of 200 invalid curve sets, each a mutation of a valid one, and on the valid ones.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import Ajv2020 from 'ajv/dist/2020.js';
import { curveSetJsonSchema } from '../../src/model/jsonSchema.ts';
import { ASCENDING_KEYWORD, CURVESET_VERSION } from '../../src/model/curveset.ts';
import { toCurveSet } from '../../src/model/curvesetIO.ts';
import { seededRandom } from '../../src/demo/random.ts';

const bases = ['samples/demo/invented-es4-us.curveset.json', 'samples/demo/invented-si3-si.curveset.json'].map((f) => JSON.parse(readFileSync(f, 'utf8')) as unknown);

const ajv = new Ajv2020({ allErrors: false, strict: true });
// The one rule standard JSON Schema cannot state, taught to ajv as the schema names it.
ajv.addKeyword({
  keyword: ASCENDING_KEYWORD,
  type: 'array',
  schemaType: 'boolean',
  validate: (on: boolean, data: unknown[]) => !on || (data.length === 2 && typeof data[0] === 'number' && typeof data[1] === 'number' && data[0] <= data[1]),
});
const validate = ajv.compile(curveSetJsonSchema());

function readerAccepts(doc: unknown): boolean {
  try {
    toCurveSet(doc);
    return true;
  } catch {
    return false;
  }
}

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };
type Path = Array<string | number>;

/** Every path in the document, with its value. */
function paths(value: Json, at: Path = [], out: Array<[Path, Json]> = []): Array<[Path, Json]> {
  out.push([at, value]);
  if (Array.isArray(value)) value.forEach((v, i) => paths(v, [...at, i], out));
  else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) paths(v, [...at, k], out);
  return out;
}

function setAt(doc: Json, path: Path, value: Json | undefined): Json {
  const copy = structuredClone(doc);
  let node = copy as Record<string | number, Json>;
  for (const key of path.slice(0, -1)) node = node[key] as Record<string | number, Json>;
  const last = path[path.length - 1] as string | number;
  if (value === undefined) {
    if (Array.isArray(node)) node.splice(last as number, 1);
    else delete node[last];
  } else node[last] = value;
  return copy;
}

/** Mutations aimed at the rules the reader enforces; `rand` picks where. */
const MUTATIONS: Array<(doc: Json, rand: () => number) => Json | undefined> = [
  // a positive quantity made zero or negative
  (doc, rand) => {
    const targets = paths(doc).filter(([p, v]) => typeof v === 'number' && /^(diameter_m|speed_rpm|density_kg_m3|specific_gravity|flow_scale)$/.test(String(p[p.length - 1])));
    const pick = targets[Math.floor(rand() * targets.length)];
    return pick ? setAt(doc, pick[0], rand() < 0.5 ? 0 : -Math.abs(pick[1] as number)) : undefined;
  },
  // a non-negative quantity made negative
  (doc, rand) => {
    const targets = paths(doc).filter(([p, v]) => typeof v === 'number' && v > 0 && /^(rms|max_residual|condition|end_of_curve_m3s|min_m3s|max_m3s)$/.test(String(p[p.length - 1])));
    const pick = targets[Math.floor(rand() * targets.length)];
    return pick ? setAt(doc, pick[0], -(pick[1] as number)) : undefined;
  },
  // a fit's domain reversed
  (doc, rand) => {
    const targets = paths(doc).filter(([p, v]) => p[p.length - 1] === 'domain' && Array.isArray(v) && (v[0] as number) < (v[1] as number));
    const pick = targets[Math.floor(rand() * targets.length)];
    return pick ? setAt(doc, pick[0], [...(pick[1] as number[])].reverse()) : undefined;
  },
  // an unknown unit token
  (doc, rand) => setAt(doc, ['display_units', ['flow', 'head', 'npsh', 'power', 'diameter'][Math.floor(rand() * 5)] as string], ['furlong', 'gpm2', 'M', 'kw/h', ''][Math.floor(rand() * 5)] as string),
  // a number replaced by a string, null or boolean
  (doc, rand) => {
    const targets = paths(doc).filter(([p, v]) => typeof v === 'number' && p.length > 0 && p[0] !== 'version');
    const pick = targets[Math.floor(rand() * targets.length)];
    return pick ? setAt(doc, pick[0], [String(pick[1]), null, true][Math.floor(rand() * 3)] as Json) : undefined;
  },
  // a required key removed
  (doc, rand) => {
    const required = ['pump', 'speed_rpm', 'family', 'fluid', 'provenance', 'display_units', 'members', 'findings'];
    return setAt(doc, [required[Math.floor(rand() * required.length)] as string], undefined);
  },
  // an unknown key added somewhere inside an object
  (doc, rand) => {
    // every object is closed except a finding's "figures", a free record of numbers
    const objects = paths(doc).filter(([p, v]) => v !== null && typeof v === 'object' && !Array.isArray(v) && !(p[0] === 'findings' && p[p.length - 1] === 'figures'));
    const pick = objects[Math.floor(rand() * objects.length)];
    return pick ? setAt(doc, [...pick[0], 'unexpected_field'], 1) : undefined;
  },
  // an enum value out of its list
  (doc, rand) => {
    const choice = Math.floor(rand() * 3);
    if (choice === 0) return setAt(doc, ['family'], 'trim');
    if (choice === 1) {
      const findings = (doc as { findings: Json[] }).findings;
      return findings.length ? setAt(doc, ['findings', Math.floor(rand() * findings.length), 'severity'], 'error') : setAt(doc, ['findings'], [{}]);
    }
    return setAt(doc, ['pump', 'suction'], 'triple');
  },
  // format, version, integer and count rules
  (doc, rand) => {
    const choice = Math.floor(rand() * 6);
    if (choice === 0) return setAt(doc, ['format'], 'pumpscribe.curves');
    if (choice === 1) return setAt(doc, ['version'], CURVESET_VERSION + 1);
    if (choice === 2) return setAt(doc, ['members'], []);
    if (choice === 3) return setAt(doc, ['pump', 'stages'], rand() < 0.5 ? 0 : 1.5);
    if (choice === 4) return setAt(doc, ['members', 0, 'curves', 'head', 'fit', 'degree'], rand() < 0.5 ? -1 : 2.5);
    return setAt(doc, ['provenance', 'source'], { file: 'x.pdf', sha256: 'ABC123' });
  },
  // a point with one coordinate, or three
  (doc, rand) => {
    const targets = paths(doc).filter(([p, v]) => p[p.length - 2] === 'points' && Array.isArray(v));
    const pick = targets[Math.floor(rand() * targets.length)];
    if (!pick) return undefined;
    const point = pick[1] as number[];
    return setAt(doc, pick[0], rand() < 0.5 ? [point[0] as number] : [...point, 1]);
  },
];

describe('the curve-set schema and the reader agree', () => {
  it('on the valid files', () => {
    for (const doc of bases) {
      expect(readerAccepts(doc)).toBe(true);
      expect(validate(doc)).toBe(true);
    }
  });

  it('on every file of a seeded corpus of 200 invalid curve sets', () => {
    const rand = seededRandom(20261202);
    const corpus: Json[] = [];
    const kinds = new Map<number, number>();
    let attempts = 0;
    while (corpus.length < 200 && attempts < 5000) {
      attempts++;
      const base = bases[Math.floor(rand() * bases.length)] as Json;
      const k = corpus.length % MUTATIONS.length;
      const mutated = MUTATIONS[k]!(base, rand);
      if (mutated === undefined) continue;
      if (readerAccepts(mutated)) {
        // A mutation that stays valid must be valid for the schema too; it is not part of the invalid corpus.
        expect(validate(mutated)).toBe(true);
        continue;
      }
      corpus.push(mutated);
      kinds.set(k, (kinds.get(k) ?? 0) + 1);
    }
    expect(corpus).toHaveLength(200);
    expect(kinds.size).toBe(MUTATIONS.length);
    const disagreements = corpus.flatMap((doc, i) => (validate(doc) ? [`file ${i} (mutation ${i % MUTATIONS.length})`] : []));
    expect(disagreements).toEqual([]);
  });
});
