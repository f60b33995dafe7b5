// Colours of the charts drawn by Recharts, kept apart from the drawing code so that legends and
// pages can use them without pulling the chart library into the page's first load.

export const FUNNEL_COLOURS = { network: '#1f514a', limit95: '#b08330', limit998: '#853223' };

export const P_CHART_COLOURS = {
  rate: '#1f514a',
  centre: '#475569',
  limit: '#853223',
  signal: '#a03c28',
  interval: '#5b8a82',
};
