/** About `count` round tick values from 0 to at least `max` (1, 2, 2.5 or 5 × a power of ten). */
export function niceTicks(max: number, count = 5): number[] {
  if (!(max > 0)) return [0, 1];
  const raw = max / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * power).find((s) => s >= raw) ?? 10 * power;
  const ticks: number[] = [];
  for (let k = 0; k * step < max + step * 0.999; k++)
    ticks.push(Number((k * step).toPrecision(12)));
  return ticks;
}
