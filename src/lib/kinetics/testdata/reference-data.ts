/**
 * Published data sets used as outside references by the tests. Values are copied from the
 * sources named beside each set; nothing here is invented.
 */

/**
 * Puromycin: Treloar (1974, MSc thesis, Univ. Toronto), reproduced in Bates & Watts, Nonlinear
 * Regression Analysis and Its Applications (1988), and R `datasets::Puromycin`.
 * Concentration in ppm, rate in counts/min/min.
 */
export const PUROMYCIN_TREATED = {
  conc: [0.02, 0.02, 0.06, 0.06, 0.11, 0.11, 0.22, 0.22, 0.56, 0.56, 1.1, 1.1],
  rate: [76, 47, 97, 107, 123, 139, 159, 152, 191, 201, 207, 200],
};
export const PUROMYCIN_UNTREATED = {
  conc: [0.02, 0.02, 0.06, 0.06, 0.11, 0.11, 0.22, 0.22, 0.56, 0.56, 1.1],
  rate: [67, 51, 84, 86, 98, 115, 131, 124, 144, 158, 160],
};

/**
 * R `datasets::DNase`, Run 1 (ELISA of recombinant DNase in rat serum; Davidian & Giltinan 1995).
 * The concentrations are those of the R data set: 0.04882812 and then 0.1953125 … 12.5 doubling
 * (there is no 0.0977 step), in duplicate.
 */
export const DNASE_RUN1 = {
  conc: [
    0.04882812, 0.04882812, 0.1953125, 0.1953125, 0.390625, 0.390625, 0.78125, 0.78125, 1.5625, 1.5625, 3.125, 3.125,
    6.25, 6.25, 12.5, 12.5,
  ],
  density: [
    0.017, 0.018, 0.121, 0.124, 0.206, 0.215, 0.377, 0.374, 0.614, 0.609, 1.019, 1.001, 1.334, 1.364, 1.73, 1.71,
  ],
};

/**
 * Ekstrøm & Sørensen, Introduction to Statistical Data Analysis for the Life Sciences, R package
 * isdals, data set `inhibitor`: I = 0, 50, 100 µM; S = 10, 25, 75, 150, 300, 600 µM, duplicates.
 */
export const ISDALS_INHIBITOR = (() => {
  const substrate = [10, 25, 75, 150, 300, 600];
  const rates: Record<number, number[]> = {
    0: [0.542, 0.763, 1.178, 1.085, 2.265, 1.989, 2.414, 2.423, 2.698, 2.6, 2.649, 2.909],
    50: [0.334, 0.296, 0.685, 0.637, 1.367, 1.364, 2.118, 1.989, 2.335, 2.216, 2.48, 2.632],
    100: [0.222, 0.221, 0.486, 0.462, 1.085, 1.119, 1.594, 1.562, 1.966, 1.944, 2.295, 2.413],
  };
  const points: { substrate: number; inhibitor: number; rate: number }[] = [];
  for (const inhibitor of [0, 50, 100]) {
    rates[inhibitor]!.forEach((rate, k) => points.push({ substrate: substrate[k >> 1]!, inhibitor, rate }));
  }
  return points;
})();
