/**
 * Props of a reference line (a limit, the centre line, the network rate): no dots, no animation.
 * Recharts 2 finds a chart's series by element type, so charts spread these into a `<Line>`
 * instead of wrapping one in a component of their own.
 */
export function guideLine(
  dataKey: string,
  name: string,
  stroke: string,
  style: { width?: number; dash?: string; step?: boolean } = {},
) {
  return {
    dataKey,
    name,
    stroke,
    strokeWidth: style.width ?? 1.5,
    ...(style.dash ? { strokeDasharray: style.dash } : {}),
    ...(style.step ? { type: 'step' as const } : {}),
    dot: false,
    isAnimationActive: false,
  };
}
