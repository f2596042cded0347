/** The colour arithmetic the palettes are checked with, against published worked values. */
import { ciede2000, closestPairs, contrastRatio, DICHROMACIES, hexToLab, MACHADO_2009, relativeLuminance, simulate, type Lab } from './colour-vision';

describe('colour vision arithmetic', () => {
  it('computes WCAG 2.1 contrast ratios', () => {
    // WCAG 2.1, definition "contrast ratio": ratios range from 1:1 to 21:1 (black on white).
    expect(contrastRatio('#000000', '#ffffff')).toBeCloseTo(21, 10);
    expect(contrastRatio('#3a7bd5', '#3a7bd5')).toBe(1);
    expect(relativeLuminance('#ffffff')).toBeCloseTo(1, 10);
    // Commonly cited pairs (values from memory): #767676 is the lightest grey with 4.5:1 on white
    // (4.54:1), #777777 just misses it (4.48:1).
    expect(contrastRatio('#767676', '#ffffff')).toBeCloseTo(4.54, 2);
    expect(contrastRatio('#ffffff', '#777777')).toBeCloseTo(4.48, 2);
  });

  it('converts sRGB to CIELAB (D65)', () => {
    const close = (a: Lab, b: Lab) => a.forEach((v, i) => expect(v).toBeCloseTo(b[i], 1));
    close(hexToLab('#ffffff'), [100, 0, 0]);
    close(hexToLab('#000000'), [0, 0, 0]);
    // sRGB red in CIELAB D65: L* 53.24, a* 80.09, b* 67.20 (common practice; values from memory).
    close(hexToLab('#ff0000'), [53.24, 80.09, 67.2]);
  });

  it('matches the CIEDE2000 test data of Sharma, Wu and Dalal (2005), Table 1', () => {
    // G. Sharma, W. Wu, E. N. Dalal, "The CIEDE2000 color-difference formula: implementation notes,
    // supplementary test data, and mathematical observations", Color Res. Appl. 30(1), 2005, Table 1
    // (pairs 1–13, 17–21, 25–34; written from memory, every pair agrees to the table's 4 decimals).
    const pairs: [Lab, Lab, number][] = [
      [[50, 2.6772, -79.7751], [50, 0, -82.7485], 2.0425],
      [[50, 3.1571, -77.2803], [50, 0, -82.7485], 2.8615],
      [[50, 2.8361, -74.02], [50, 0, -82.7485], 3.4412],
      [[50, -1.3802, -84.2814], [50, 0, -82.7485], 1.0],
      [[50, -1.1848, -84.8006], [50, 0, -82.7485], 1.0],
      [[50, -0.9009, -85.5211], [50, 0, -82.7485], 1.0],
      [[50, 0, 0], [50, -1, 2], 2.3669],
      [[50, -1, 2], [50, 0, 0], 2.3669],
      [[50, 2.49, -0.001], [50, -2.49, 0.0009], 7.1792],
      [[50, 2.49, -0.001], [50, -2.49, 0.001], 7.1792],
      [[50, 2.49, -0.001], [50, -2.49, 0.0011], 7.2195],
      [[50, 2.49, -0.001], [50, -2.49, 0.0012], 7.2195],
      [[50, -0.001, 2.49], [50, 0.0009, -2.49], 4.8045],
      [[50, 2.5, 0], [73, 25, -18], 27.1492],
      [[50, 2.5, 0], [61, -5, 29], 22.8977],
      [[50, 2.5, 0], [56, -27, -3], 31.903],
      [[50, 2.5, 0], [58, 24, 15], 19.4535],
      [[50, 2.5, 0], [50, 3.1736, 0.5854], 1.0],
      [[60.2574, -34.0099, 36.2677], [60.4626, -34.1751, 39.4387], 1.2644],
      [[63.0109, -31.0961, -5.8663], [62.8187, -29.7946, -4.0864], 1.263],
      [[61.2901, 3.7196, -5.3901], [61.4292, 2.248, -4.962], 1.8731],
      [[35.0831, -44.1164, 3.7933], [35.0232, -40.0716, 1.5901], 1.8645],
      [[22.7233, 20.0904, -46.694], [23.0331, 14.973, -42.5619], 2.0373],
      [[36.4612, 47.858, 18.3852], [36.2715, 50.5065, 21.2231], 1.4146],
      [[90.8027, -2.0831, 1.441], [91.1528, -1.6435, 0.0447], 1.4441],
      [[90.9257, -0.5406, -0.9208], [88.6381, -0.8985, -0.7239], 1.5381],
      [[6.7747, -0.2908, -2.4247], [5.8714, -0.0985, -2.2286], 0.6377],
      [[2.0776, 0.0795, -1.135], [0.9033, -0.0636, -0.5514], 0.9082],
    ];
    let compared = 0;
    for (const [a, b, expected] of pairs) {
      expect({ a, b, d: +ciede2000(a, b).toFixed(4) }).toEqual({ a, b, d: expected });
      compared++;
    }
    expect(compared).toBe(28);
  });

  it('simulates dichromacy with matrices that keep white and greys as they are', () => {
    for (const kind of DICHROMACIES) {
      for (const row of MACHADO_2009[kind]) expect(row[0] + row[1] + row[2]).toBeCloseTo(1, 5);
      for (const grey of ['#ffffff', '#000000', '#777777']) expect(simulate(grey, kind)).toBe(grey);
    }
    // A red and an olive green of about equal lightness, the textbook red-green confusion, fall
    // together without middle-wave cones and stay apart without short-wave ones (common practice).
    const red = '#c0392b';
    const green = '#6b8e23';
    expect(closestPairs([red, green]).normal.distance).toBeGreaterThan(30);
    expect(closestPairs([red, green]).deuteranopia.distance).toBeLessThan(10);
    expect(closestPairs([red, green]).tritanopia.distance).toBeGreaterThan(20);
  });
});
