/**
 * Colours of the plan view and panels. Track hues come from the colour-blind-safe set of Okabe &
 * Ito (2008, "Color Universal Design"); their blue is lightened for a dark background. Colour is
 * never the only cue: every track also carries its id label, and status is shown by shape.
 */
export const background = 0x0c1116;
export const ringColour = 0x5d6b78;
export const ringLabelColour = 0xb8c4cf;
export const gridColour = 0x2a343e;
export const coverageColour = 0x1a2530;
export const detectionColour = 0xe8edf2;
export const fixedEchoColour = 0x8a96a3;
/** Okabe–Ito yellow, dashed: the commanded path. No track uses yellow. */
export const commandedColour = 0xf0e442;
export const antennaColour = 0x9ad7c0;
export const selectionColour = 0xffffff;

/**
 * Okabe–Ito orange, sky blue, bluish green, reddish purple, vermillion. Their blue is left out:
 * on this background it is too dark and too close to the sky blue. With more than five tracks
 * hues repeat, which is why the id label, not the colour, identifies a track.
 */
export const trackColours = [0xe69f00, 0x56b4e9, 0x009e73, 0xcc79a7, 0xd55e00] as const;

export function trackColour(id: number): number {
  return trackColours[id % trackColours.length];
}

export function cssColour(c: number): string {
  return `#${c.toString(16).padStart(6, '0')}`;
}

/** Marker shape by status, so tentative and coasting tracks read differently without colour. */
export type MarkerShape = 'disc' | 'ring' | 'diamond';
export function shapeFor(status: 'tentative' | 'confirmed' | 'coasting'): MarkerShape {
  return status === 'confirmed' ? 'disc' : status === 'tentative' ? 'ring' : 'diamond';
}
