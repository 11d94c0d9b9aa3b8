/** The safety caution every briefing export and print carries. */
export const BRIEFING_CAUTION_TITLE = 'Safety caution';
export const BRIEFING_CAUTION: readonly string[] = [
  'A battery bank can deliver thousands of amperes into a short circuit: fault currents can weld tools, melt conductors and cause burns, fire or explosion.',
  'De-energize before work: open the battery disconnect, remove the fuses and check for zero volts with a rated meter. Batteries themselves stay live.',
  'Use insulated tools, take off rings and watches, and keep one hand clear when working on live terminals.',
  'Fit a fuse of the right interrupting rating close to each battery positive, before anything else on the conductor.',
  'Follow local electrical codes, the equipment makers\u2019 instructions and licensed practice. This sheet informs the work; it is not an approval to install.',
];
