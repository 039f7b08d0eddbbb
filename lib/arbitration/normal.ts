/**
 * Standard normal distribution function Φ(x), by Hart's rational approximation (algorithm 5666,
 * as set out by G. West, "Better approximations to cumulative normal functions", 2005), accurate to
 * about 1e-14 over the whole line. Written out rather than taken from a package so that the module
 * stays dependency-free in the browser.
 */
export function normalCdf(x: number): number {
  if (Number.isNaN(x)) return Number.NaN;
  const z = Math.abs(x);
  let tail: number;
  if (z > 37) {
    tail = 0;
  } else {
    const density = Math.exp((-z * z) / 2);
    if (z < 7.07106781186547) {
      let numerator = 3.52624965998911e-2 * z + 0.700383064443688;
      numerator = numerator * z + 6.37396220353165;
      numerator = numerator * z + 33.912866078383;
      numerator = numerator * z + 112.079291497871;
      numerator = numerator * z + 221.213596169931;
      numerator = numerator * z + 220.206867912376;
      let denominator = 8.83883476483184e-2 * z + 1.75566716318264;
      denominator = denominator * z + 16.064177579207;
      denominator = denominator * z + 86.7807322029461;
      denominator = denominator * z + 296.564248779674;
      denominator = denominator * z + 637.333633378831;
      denominator = denominator * z + 793.826512519948;
      denominator = denominator * z + 440.413735824752;
      tail = (density * numerator) / denominator;
    } else {
      // Far tail: continued fraction of Mills' ratio.
      let fraction = z + 0.65;
      fraction = z + 4 / fraction;
      fraction = z + 3 / fraction;
      fraction = z + 2 / fraction;
      fraction = z + 1 / fraction;
      tail = density / fraction / 2.506628274631;
    }
  }
  return x > 0 ? 1 - tail : tail;
}
