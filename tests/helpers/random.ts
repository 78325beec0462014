/** Seeded random numbers for tests live beside the invented demo data that also uses them. */
export { seededNormal, seededRandom } from '../../src/demo/random.ts';
