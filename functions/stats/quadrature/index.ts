/**
 * The quadrature engine of the read-outs, read top-down:
 *  - tabulated.ts   TabulatedDistribution and tabulate(): a density tabulated on Gauss–Legendre panels
 *                   in its working variable, with both tails at every node;
 *  - window.ts      where the panels go (the window search and the width rule);
 *  - panelIntegral.ts  integration inside one panel (whole panel, and the one partial-integral kernel);
 *  - panelRule.ts   the 16-point rule, its fixed tables and the barycentric interpolation on a panel.
 * The comparisons (../compare/) import what they need from here.
 */
export { TabulatedDistribution, tabulate } from './tabulated';
export type { TabulationOptions } from './tabulated';
export { panelLogIntegral } from './panelIntegral';
export { PANEL_NODES, PANEL_ORDER } from './panelRule';
