/** The study the speed-family tests share: one pump on variable speed, 90 m³/h against 6–8 m static head (invented). */
import { parseStudy } from '../../src/model/study.ts';
import { ISSUE_STUDY } from '../study/issueStudy.ts';

export const SPEED_CONTROL_STUDY = parseStudy({
  ...ISSUE_STUDY,
  duty: { flow: 90 },
  suction: { surface_above_eye: [1.0, 1.0], pipes: [{ diameter: 154.1, length: 10, roughness: 0.045, k: 1.0 }] },
  discharge: { static_head: [6, 8], pipes: [{ diameter: 154.1, length: 100, roughness: 0.045, k: 3 }] },
  options: [{ name: 'speed', curveset: 'x', impeller: 'drawn', control: 'speed' }],
});
