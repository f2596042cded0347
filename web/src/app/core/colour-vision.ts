/**
 * Colour arithmetic the palettes are checked with (web/src/app/core/colour-vision.spec.ts and the
 * palette specs): WCAG 2.1 relative luminance and contrast ratio, CIELAB (D65) and the CIEDE2000
 * colour difference, and a simulation of the three dichromacies. Pure functions on '#rrggbb'.
 */

/** An sRGB colour as three channels in 0..1. */
export type Rgb = readonly [number, number, number];
/** A CIELAB colour (L*, a*, b*), D65 white. */
export type Lab = readonly [number, number, number];

/** '#rrggbb' as channels in 0..1. */
export function hexToRgb(hex: string): Rgb {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) throw new Error(`not a #rrggbb colour: ${hex}`);
  return [parseInt(m[1], 16) / 255, parseInt(m[2], 16) / 255, parseInt(m[3], 16) / 255];
}

/** sRGB channel to linear light (IEC 61966-2-1; the 0.04045 knee as in CSS Color 4, WCAG 2.1 writes 0.03928, the same for 8-bit values). */
function toLinear(c: number): number {
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

function fromLinear(c: number): number {
  const v = Math.min(1, Math.max(0, c));
  return v <= 0.0031308 ? 12.92 * v : 1.055 * v ** (1 / 2.4) - 0.055;
}

/** WCAG 2.1 relative luminance (definition "relative luminance", https://www.w3.org/TR/WCAG21/#dfn-relative-luminance). */
export function relativeLuminance(hex: string): number {
  const [r, g, b] = hexToRgb(hex).map(toLinear);
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

/** WCAG 2.1 contrast ratio (L1 + 0.05) / (L2 + 0.05), lighter over darker (https://www.w3.org/TR/WCAG21/#dfn-contrast-ratio). */
export function contrastRatio(a: string, b: string): number {
  const la = relativeLuminance(a);
  const lb = relativeLuminance(b);
  return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05);
}

/** sRGB to CIELAB with the D65 white (sRGB matrix of IEC 61966-2-1; CIE 15 Lab formulas). */
export function hexToLab(hex: string): Lab {
  return linearToLab(hexToRgb(hex).map(toLinear) as unknown as Rgb);
}

function linearToLab([r, g, b]: Rgb): Lab {
  const x = (0.4124564 * r + 0.3575761 * g + 0.1804375 * b) / 0.95047;
  const y = 0.2126729 * r + 0.7151522 * g + 0.072175 * b;
  const z = (0.0193339 * r + 0.119192 * g + 0.9503041 * b) / 1.08883;
  const f = (t: number): number => (t > 216 / 24389 ? Math.cbrt(t) : (24389 / 27 * t + 16) / 116);
  const fx = f(x);
  const fy = f(y);
  const fz = f(z);
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

/**
 * CIEDE2000 colour difference with kL = kC = kH = 1: G. Sharma, W. Wu, E. N. Dalal, "The CIEDE2000
 * color-difference formula: implementation notes, supplementary test data, and mathematical
 * observations", Color Research & Application 30(1), 2005, equations (1)–(22).
 */
export function ciede2000(lab1: Lab, lab2: Lab): number {
  const [L1, a1, b1] = lab1;
  const [L2, a2, b2] = lab2;
  const deg = Math.PI / 180;
  const cBar = (Math.hypot(a1, b1) + Math.hypot(a2, b2)) / 2;
  const g = 0.5 * (1 - Math.sqrt(cBar ** 7 / (cBar ** 7 + 25 ** 7)));
  const a1p = (1 + g) * a1;
  const a2p = (1 + g) * a2;
  const c1p = Math.hypot(a1p, b1);
  const c2p = Math.hypot(a2p, b2);
  const hue = (b: number, a: number): number => {
    if (a === 0 && b === 0) return 0;
    const h = Math.atan2(b, a) / deg;
    return h < 0 ? h + 360 : h;
  };
  const h1p = hue(b1, a1p);
  const h2p = hue(b2, a2p);
  const dLp = L2 - L1;
  const dCp = c2p - c1p;
  let dhp = 0;
  if (c1p * c2p !== 0) {
    dhp = h2p - h1p;
    if (dhp > 180) dhp -= 360;
    else if (dhp < -180) dhp += 360;
  }
  const dHp = 2 * Math.sqrt(c1p * c2p) * Math.sin((dhp / 2) * deg);
  const lBarP = (L1 + L2) / 2;
  const cBarP = (c1p + c2p) / 2;
  let hBarP = h1p + h2p;
  if (c1p * c2p !== 0) {
    if (Math.abs(h1p - h2p) <= 180) hBarP = (h1p + h2p) / 2;
    else hBarP = h1p + h2p < 360 ? (h1p + h2p + 360) / 2 : (h1p + h2p - 360) / 2;
  }
  const t = 1 - 0.17 * Math.cos((hBarP - 30) * deg) + 0.24 * Math.cos(2 * hBarP * deg)
    + 0.32 * Math.cos((3 * hBarP + 6) * deg) - 0.2 * Math.cos((4 * hBarP - 63) * deg);
  const dTheta = 30 * Math.exp(-(((hBarP - 275) / 25) ** 2));
  const rc = 2 * Math.sqrt(cBarP ** 7 / (cBarP ** 7 + 25 ** 7));
  const sl = 1 + (0.015 * (lBarP - 50) ** 2) / Math.sqrt(20 + (lBarP - 50) ** 2);
  const sc = 1 + 0.045 * cBarP;
  const sh = 1 + 0.015 * cBarP * t;
  const rt = -Math.sin(2 * dTheta * deg) * rc;
  return Math.sqrt((dLp / sl) ** 2 + (dCp / sc) ** 2 + (dHp / sh) ** 2 + rt * (dCp / sc) * (dHp / sh));
}

/** The colour-vision deficiencies the palettes are checked under. */
export const DICHROMACIES = ['protanopia', 'deuteranopia', 'tritanopia'] as const;
export type Dichromacy = (typeof DICHROMACIES)[number];

/**
 * Simulation matrices on linear sRGB at severity 1.0 from G. M. Machado, M. M. Oliveira,
 * L. A. F. Fernandes, "A physiologically-based model for simulation of color vision deficiency",
 * IEEE TVCG 15(6), 2009 (the table of matrices on their project page). Values written from
 * memory; they agree with the copies in several public colour tools, and every row sums to 1
 * (white stays white), which colour-vision.spec.ts checks.
 */
export const MACHADO_2009: Readonly<Record<Dichromacy, readonly (readonly [number, number, number])[]>> = {
  protanopia: [[0.152286, 1.052583, -0.204868], [0.114503, 0.786281, 0.099216], [-0.003882, -0.048116, 1.051998]],
  deuteranopia: [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.01182, 0.04294, 0.968881]],
  tritanopia: [[1.255528, -0.076749, -0.178779], [-0.078411, 0.930809, 0.147602], [0.004733, 0.691367, 0.3039]],
};

/** How `hex` looks to someone with `kind`, as '#rrggbb' (linear-light matrix, clamped to the sRGB gamut). */
export function simulate(hex: string, kind: Dichromacy): string {
  const [r, g, b] = hexToRgb(hex).map(toLinear);
  const m = MACHADO_2009[kind];
  const out = m.map((row) => fromLinear(row[0] * r + row[1] * g + row[2] * b));
  return '#' + out.map((c) => Math.round(c * 255).toString(16).padStart(2, '0')).join('');
}

/** CIEDE2000 difference of two '#rrggbb' colours, as seen with normal vision or with `kind`. */
export function colourDistance(a: string, b: string, kind?: Dichromacy): number {
  const sa = kind ? simulate(a, kind) : a;
  const sb = kind ? simulate(b, kind) : b;
  return ciede2000(hexToLab(sa), hexToLab(sb));
}

/** The smallest pairwise distance of `colours` under normal vision and each dichromacy, with the closest pair. */
export function closestPairs(colours: readonly string[]): Record<'normal' | Dichromacy, { distance: number; pair: readonly [string, string] }> {
  const worst = (kind?: Dichromacy) => {
    let best = { distance: Infinity, pair: ['', ''] as readonly [string, string] };
    for (let i = 0; i < colours.length; i++) {
      for (let j = i + 1; j < colours.length; j++) {
        const d = colourDistance(colours[i], colours[j], kind);
        if (d < best.distance) best = { distance: d, pair: [colours[i], colours[j]] };
      }
    }
    return best;
  };
  return { normal: worst(), protanopia: worst('protanopia'), deuteranopia: worst('deuteranopia'), tritanopia: worst('tritanopia') };
}

/**
 * What "distinguishable" means for Quarterturn's categorical palettes (series, robot states,
 * timeline categories). A CIEDE2000 difference of about 1 is a just-noticeable difference between
 * large patches side by side (Sharma et al. 2005); chart marks are small and apart, where far
 * larger steps are needed to read two colours as two categories rather than two shades (common
 * practice puts that near 10). Normal vision gets twice that margin; each simulated dichromacy
 * keeps at least 12, above that reading level, since a dichromat loses a whole colour axis and
 * the shapes, dashes and patterns beside the colours still carry the meaning.
 */
export const MIN_DISTANCE_NORMAL = 20;
export const MIN_DISTANCE_SIMULATED = 12;
/** WCAG 2.1 success criterion 1.4.11 (non-text contrast): graphical objects need 3:1 against adjacent colours. */
export const MIN_NON_TEXT_CONTRAST = 3;
