// Colours: the Okabe–Ito palette (Okabe & Ito, "Color Universal Design", 2008), chosen because its
// eight colours stay distinguishable under the common forms of colour blindness. Colour is never the
// only carrier of meaning here: zones also carry their letter and a shape, predicted lines a marker
// shape and a dash pattern.
export const okabeIto = {
  black: '#000000',
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
} as const;

/** Measured data is drawn in ink; overlays take the palette's strong hues. */
export const ink = '#1d232b';
export const gridInk = 'rgba(29, 35, 43, 0.10)';

/** Series colours for charts with several curves, in order of use. */
export const seriesColours = [okabeIto.blue, okabeIto.vermillion, okabeIto.bluishGreen, okabeIto.reddishPurple, okabeIto.orange, okabeIto.skyBlue, okabeIto.black];

/** Predicted-line families: harmonics of a base rate and sidebands around a carrier. */
export const familyColours = {
  harmonic: okabeIto.vermillion,
  sideband: okabeIto.reddishPurple,
  other: okabeIto.orange,
} as const;
