/** Test data: the study-file shape issue 12 asks to accept (invented numbers). */
export const ISSUE_STUDY = {
  units: 'si',
  liquid: { temperature: 30 },
  site: { pressure: 96 },
  duty: { flow: 230 },
  suction: { surface_above_eye: [1.0, 1.0], pipes: [{ diameter: 202.7, length: 20, roughness: 0.045, k: 1.0 }] },
  discharge: { static_head: [18, 22], pipes: [{ diameter: 202.7, length: 400, roughness: 0.045, k: 6.5 }] },
  options: [
    { name: '8 in pipe', curveset: 'pump-a.curveset.json', impeller: 'trim' },
    { name: '6 in pipe', curveset: 'pump-a.curveset.json', impeller: 'trim', discharge: { pipes: [{ diameter: 154.1, length: 400, roughness: 0.045, k: 6.5 }] } },
  ],
  operation: { hours_per_year: 6000, tariff: 0.15, motor_efficiency: 94, years: 20, discount_rate: 5 },
};

