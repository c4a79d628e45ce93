// An invented library of n stocks for size tests (codes LG-00001 …; values spread over the demo's ranges).
// Invented data: not real products, no calculation is checked against it.
import type { Component } from '../../src/core/formulation/model';
import { libraryToCsv } from '../../src/state/library-io';

export function largeLibrary(n: number): Component[] {
  const out: Component[] = [];
  for (let i = 0; i < n; i++) {
    const kv40 = 20 + (i % 97) * 5; // 20–500 mm²/s
    const kv100 = Math.round((kv40 / 8 + 1) * 100) / 100; // falls with temperature, VI in a plausible range
    out.push({
      id: `lg-${i}`,
      code: `LG-${String(i + 1).padStart(5, '0')}`,
      name: `Invented stock ${i + 1}`,
      category: i % 7 === 0 ? 'group-iii' : 'group-ii',
      viscosityPoints: [
        { tempC: 40, kv: kv40 },
        { tempC: 100, kv: kv100 },
      ],
      density15: 0.85 + (i % 5) * 0.005,
      anilinePoint: 110 + (i % 20),
      pourPoint: -15,
      flashPoint: 220,
      sulfurPct: null,
      saturatesPct: null,
      price: { amount: 1 + (i % 50) / 100, basis: 'per-kg', currency: 'EUR' },
      availability: 'available',
      oxidationRating: null,
      shearLossPct: null,
      kv40LotSpreadPct: null,
      calibration: null,
      source: 'invented size-test data',
      sourceDate: '2025-01-01',
      notes: '',
    });
  }
  return out;
}

/** The CSV of `largeLibrary(n)` (every column). */
export function largeLibraryCsv(n: number): string {
  return libraryToCsv(largeLibrary(n));
}
