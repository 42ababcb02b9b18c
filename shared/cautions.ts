/** The cautions shown in the README, by `weir init` and on the reviewer's site page. */
export const SAFETY_CAUTIONS: readonly string[] = [
  'Only qualified, licensed electricians work inside a switchboard or on CT and meter wiring.',
  'Isolate the supply and prove it dead before touching any conductor; treat CT secondaries as live and never open-circuit a 1 A / 5 A CT under load.',
  'Local wiring rules and the network operator\'s connection agreement take precedence over anything Weir says.',
  'A passing check is not a certificate: it finds common mistakes in the file, not on the site. Commission and test on site as your licence requires.',
];
