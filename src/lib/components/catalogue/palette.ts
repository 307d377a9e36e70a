/** Series colours for charts: graphite shades and verdigris tints, never the caution amber. */
export const SERIES = ['#2c7a6b', '#2a2926', '#7aa89c', '#8a857a', '#1f5c50', '#57544d', '#a9c9c0', '#b5ae9f'];
export const seriesColor = (i: number) => SERIES[i % SERIES.length];
