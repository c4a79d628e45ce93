/**
 * Library import and export. The preview (parsing and checking every row) lives in `library-import.ts`
 * and is re-exported here; this module applies a confirmed preview to the library store and writes the
 * library as CSV or JSON.
 */
import type { Component } from '../core/formulation/model';
import { notEnteredFields } from '../core/formulation/entered-values';
import { libraryRoomProblem, useLibraryStore } from './library';
import { writeCsv, type CsvCell } from './csv';
import { CSV_COLUMNS, type CsvColumn, type ImportPreview } from './library-import';

export * from './library-import';

/**
 * Apply a confirmed, valid preview to the library (one undo step). Refuses an invalid preview, and
 * one whose additions would take the library over its limit (`libraryRoomProblem` says why).
 */
export function applyLibraryImport(preview: ImportPreview): boolean {
  if (!preview.valid) return false;
  if (libraryRoomProblem(useLibraryStore.getState().components.length, preview.adds, 'import')) return false;
  const comps = preview.rows.filter((r) => r.action === 'add' || r.action === 'update').map((r) => r.component!);
  if (comps.length) useLibraryStore.getState().upsertByCode(comps);
  return true;
}

// ---------------------------------------------------------------------------------------------
// Export

/**
 * The library as CSV. A value not yet entered (a stock just added) is written as an empty cell, never
 * as its placeholder: importing the file back then asks for it instead of taking it as measured. (JSON
 * export keeps the stock's list of values not yet entered.)
 */
export function libraryToCsv(components: readonly Component[]): string {
  const rows = components.map((c) => {
    const pending = notEnteredFields(c);
    const at = (t: 40 | 100) => (pending.includes(t === 40 ? 'kv40' : 'kv100') ? null : c.viscosityPoints.find((p) => p.tempC === t)?.kv);
    const record: Record<CsvColumn, CsvCell> = {
      code: c.code,
      name: c.name,
      category: c.category,
      kv40_mm2s: at(40),
      kv100_mm2s: at(100),
      density15_kg_per_l: pending.includes('density15') ? null : c.density15,
      aniline_point_c: c.anilinePoint,
      pour_point_c: c.pourPoint,
      flash_point_c: c.flashPoint,
      sulfur_pct: c.sulfurPct,
      saturates_pct: c.saturatesPct,
      price: c.price.amount,
      price_basis: c.price.basis,
      currency: c.price.currency,
      availability: c.availability,
      oxidation_rating: c.oxidationRating,
      shear_loss_pct: c.shearLossPct,
      kv40_shear_loss_pct: c.shearLoss40Pct ?? null,
      kv40_lot_spread_pct: c.kv40LotSpreadPct,
      source: c.source,
      source_date: c.sourceDate,
      notes: c.notes,
    };
    return CSV_COLUMNS.map((k) => record[k]);
  });
  return writeCsv(CSV_COLUMNS, rows);
}

export function libraryToJson(components: readonly Component[], exportedAt = new Date().toISOString()): string {
  return JSON.stringify({ format: 'blendbench-library', exportedAt, components }, null, 1);
}
