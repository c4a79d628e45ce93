// @vitest-environment jsdom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import { BlendSheetView } from '../../../src/features/blend-sheet/BlendSheetView';
import { csvFileName, toCsv } from '../../../src/features/blend-sheet/csv';
import type { SheetPrediction } from '../../../src/core/sheet/blend-sheet';
import type { Component, ComponentCategory, Recipe } from '../../../src/core/formulation/model';
import { newRecipeLifecycle } from '../../../src/core/formulation/model';

afterEach(cleanup);

function comp(id: string, category: ComponentCategory, kv40: number, density15: number, price: number): Component {
  return {
    id,
    code: id.toUpperCase(),
    name: `Invented stock ${id}`,
    category,
    viscosityPoints: [
      { tempC: 40, kv: kv40 },
      { tempC: 100, kv: kv40 / 12 },
    ],
    density15,
    anilinePoint: 110,
    pourPoint: -9,
    flashPoint: 230,
    sulfurPct: null,
    saturatesPct: null,
    price: { amount: price, basis: 'per-kg', currency: 'EUR' },
    availability: 'available',
    oxidationRating: null,
    shearLossPct: null,
    kv40LotSpreadPct: null,
    calibration: null,
    source: 'invented test data',
    sourceDate: '2025-01-01',
    notes: '',
  };
}

const components = [
  comp('hv', 'group-ii', 600, 0.885, 1.4),
  comp('n150', 'group-ii', 30, 0.862, 1.1),
  comp('add', 'additive-package', 300, 1.05, 4.0),
];
const recipe: Recipe = {
  id: 'r320',
  name: 'Invented Gear 320',
  grade: 320,
  lines: [
    { componentId: 'n150', massFraction: 0.3 },
    { componentId: 'hv', massFraction: 0.68 },
    { componentId: 'add', massFraction: 0.02 },
  ],
  revision: 4,
  isReference: true,
  notes: '',
  updatedAt: '2025-03-01T10:00:00Z',
  ...newRecipeLifecycle(),
  status: 'approved',
  approvedAt: '2025-03-01T10:00:00Z',
};
const prediction: SheetPrediction = {
  kv40: 318.2,
  kv100: 24.3,
  reportedVi: 98,
  density15: 0.8823,
  anilinePoint: 118,
  flashPoint: 238,
  pourPoint: -12,
  operating: { tempC: 65, kv: 100.4 },
};

function renderSheet(extra: Partial<Parameters<typeof BlendSheetView>[0]> = {}) {
  return render(
    <BlendSheetView
      components={components}
      recipes={[recipe]}
      recipeId="r320"
      companyName="Invented Lubricants Plant"
      predict={() => prediction}
      today="2025-06-02"
      {...extra}
    />,
  );
}

describe('BlendSheetView', () => {
  it('names the blend-viscosity method and marks a flash estimate beyond its index range (issue 13)', () => {
    renderSheet({ method: 'd7152-wright', predict: () => ({ ...prediction, flashPointExtrapolated: true }) });
    expect(screen.getByTestId('method-note').textContent).toBe(
      'Blend viscosity method: D7152 Wright method (two temperatures per component), volume fractions.',
    );
    const qc = screen.getByRole('table', { name: /Predicted properties and QC release/ });
    expect(within(qc).getByText('Flash point, open cup (extrapolated estimate)')).toBeTruthy();
    cleanup();
    renderSheet();
    // The default rule of a sheet rendered without one; no extrapolation note when no row is marked.
    expect(screen.getByTestId('method-note').textContent).toBe('Blend viscosity method: Refutas blending number (mass fractions).');
    expect(within(screen.getByRole('table', { name: /Predicted properties and QC release/ })).queryByText(/extrapolated estimate/)).toBeNull();
  });

  it('prints the header, the component table in charging order and totals equal to the batch', () => {
    renderSheet();
    expect(screen.getByText('Invented Lubricants Plant')).toBeTruthy();
    expect(screen.getByText('ISO VG 320')).toBeTruthy();
    const table = screen.getByRole('table', { name: /Components, in charging order/ });
    const rows = within(table).getAllByRole('row');
    // header + 3 components + total
    expect(rows).toHaveLength(5);
    // common practice (domain notes): heavy base stock first, additive package last
    expect(within(rows[1]!).getByRole('rowheader').textContent).toBe('HV');
    expect(within(rows[3]!).getByRole('rowheader').textContent).toBe('ADD');
    // 1000 kg batch: 680.0 + 300.0 + 20.0 = 1000.0 (exact fractions, by hand)
    expect(rows[1]!.textContent).toContain('680.0');
    expect(rows[4]!.textContent).toContain('1000.0');
    // operator's initials column exists
    expect(within(table).getByRole('columnheader', { name: 'Initials' })).toBeTruthy();
  });

  it('hides prices on the plant copy and shows them on the costing copy', () => {
    renderSheet();
    expect(screen.queryByText(/per batch/)).toBeNull();
    expect(screen.queryByRole('columnheader', { name: /Price\/kg/ })).toBeNull();
    fireEvent.click(screen.getByLabelText('Costing copy'));
    expect(screen.getByRole('columnheader', { name: 'Price/kg' })).toBeTruthy();
    expect(screen.getByRole('table', { name: /prices and costs in EUR/ })).toBeTruthy();
    // 0.3·1.1 + 0.68·1.4 + 0.02·4.0 = 1.362 per kg → 1362.00 per 1000 kg batch (by hand)
    expect(screen.getByText(/1362\.00 EUR per batch/)).toBeTruthy();
  });

  it('costs in the base currency with the rates and dates printed, and never mixes a currency without a rate (issue 10, item 13)', () => {
    const usd = components.map((c) => (c.id === 'hv' ? { ...c, price: { ...c.price, amount: 2, currency: 'USD' } } : c));
    // Invented rate, chosen for an exact check: 2 USD/kg × 0.7 = 1.4 EUR/kg, so the batch costs as before.
    renderSheet({ components: usd, exchange: { base: 'EUR', rates: [{ currency: 'USD', rate: 0.7, asOf: '2026-11-30' }] } });
    fireEvent.click(screen.getByLabelText('Costing copy'));
    // 0.3·1.1 + 0.68·(2 × 0.7) + 0.02·4.0 = 1.362 EUR per kg → 1362.00 per 1000 kg batch (by hand)
    expect(screen.getByText(/1362\.00 EUR per batch/)).toBeTruthy();
    expect(screen.getByTestId('rates-used').textContent).toMatch(/USD → EUR 0\.70 as of 2026-11-30/);
    cleanup();
    renderSheet({ components: usd, exchange: { base: 'EUR', rates: [] } });
    fireEvent.click(screen.getByLabelText('Costing copy'));
    expect(screen.getByText(/Cost not available: HV is priced in USD, which has no exchange rate to EUR/)).toBeTruthy();
    expect(screen.queryByText(/per batch/)).toBeNull();
  });

  it('recomputes quantities for a batch given in litres', () => {
    renderSheet();
    fireEvent.change(screen.getByLabelText('Batch size'), { target: { value: '2000' } });
    fireEvent.change(screen.getByLabelText('Batch size unit'), { target: { value: 'litres' } });
    expect(screen.getByText(/^2000\.0 L at 15 °C/)).toBeTruthy();
  });

  it('shows predicted properties beside release targets, methods and blank measured cells', () => {
    renderSheet();
    const qc = screen.getByRole('table', { name: /Predicted properties and QC release/ });
    expect(within(qc).getByText('318.2')).toBeTruthy();
    // ISO 3448 VG 320 band 288–352 (check-values G2), plant aim ±5 % (common practice)
    expect(within(qc).getByText('304.0–336.0 (ISO VG 320: 288.0–352.0)')).toBeTruthy();
    for (const m of ['ASTM D445', 'ASTM D2270', 'ASTM D4052', 'ASTM D92', 'ASTM D97']) {
      expect(within(qc).getAllByText(m).length).toBeGreaterThan(0);
    }
    const measured = qc.querySelectorAll('tbody td.bs-measured');
    expect(measured.length).toBeGreaterThan(5);
    measured.forEach((td) => expect(td.textContent).toBe(''));
  });

  it('holds a sheet whose prediction misses its release target, on screen, on the Print button and in print', () => {
    renderSheet({ predict: () => ({ ...prediction, kv40: 228.04 }) });
    // VG 320 plant aim band 304–336 (ISO 3448 band 288–352, check-values G2; ±5 % common practice)
    const hold = screen.getByTestId('release-hold');
    expect(hold.textContent).toMatch(/HOLD — not for release/);
    expect(hold.textContent).toMatch(/misses a release limit — Kinematic viscosity at 40 °C: predicted 228\.0 mm²\/s, limit 304\.0–336\.0/);
    expect(screen.getByRole('button', { name: 'Print — HOLD — not for release' })).toBeTruthy();
    expect(screen.getByRole('alert').textContent).toMatch(/This sheet will print with the hold/);
  });

  it('holds a sheet that uses a withdrawn stock, or a draft, and says why (issue 10, item 11)', () => {
    const withdrawn = components.map((c) => (c.id === 'hv' ? { ...c, availability: 'withdrawn' as const } : c));
    renderSheet({ components: withdrawn });
    expect(screen.getByTestId('release-hold').textContent).toMatch(/uses a withdrawn stock: HV/);
    cleanup();
    renderSheet({ recipes: [{ ...recipe, status: 'draft', approvedAt: null }] });
    expect(screen.getByTestId('release-hold').textContent).toMatch(/draft: it has not been approved/);
    cleanup();
    // An approved recipe on available stocks whose prediction meets every limit: no hold.
    renderSheet();
    expect(screen.queryByTestId('release-hold')).toBeNull();
    expect(screen.getByRole('button', { name: 'Print' })).toBeTruthy();
  });

  it('holds a sheet whose prediction misses a limit of the recipe specification', () => {
    // flash estimate 238 °C against an invented specification minimum of 240 °C
    renderSheet({ recipes: [{ ...recipe, specification: { ...recipe.specification, grade: recipe.grade, flashMin: 240, reference: 'SPEC-1' } }] });
    expect(screen.getByTestId('release-hold').textContent).toMatch(/Flash point, open cup \(estimate\): predicted 238 °C, limit ≥ 240/);
    const qc = screen.getByRole('table', { name: /Predicted properties and QC release/ });
    expect(within(qc).getAllByText('Per specification').length).toBeGreaterThan(3);
    expect(screen.getByText(/product specification SPEC-1/)).toBeTruthy();
  });

  it('holds a sheet whose specification was written for another grade and never prints its limits (session 19, defect 1)', () => {
    // An invented VG 460 specification on this recipe of another grade: flash minimum 240 °C, reference SPEC-460.
    renderSheet({ recipes: [{ ...recipe, specification: { ...recipe.specification, grade: 460, flashMin: 240, reference: 'SPEC-460' } }] });
    expect(screen.getByTestId('release-hold').textContent).toMatch(new RegExp(`written for VG 460, not for this VG ${recipe.grade} recipe: its limits are not printed`));
    expect(screen.queryByText(/SPEC-460/)).toBeNull();
    expect(screen.queryByText(/limit ≥ 240/)).toBeNull();
    const qc = screen.getByRole('table', { name: /Predicted properties and QC release/ });
    expect(within(qc).queryByText(/≥ 240/)).toBeNull();
  });

  it('holds a sheet whose prediction misses one of the recipe’s own constraints', () => {
    // The full prediction is needed to recheck constraints; a minimum VI of 120 cannot hold for VI ≈ 98 (invented).
    const properties = { kv40: 318.2, kv100: 24.3, vi: 98.2, polymerFraction: 0, anilinePoint: { value: 118 }, pourPoint: -12, flashPoint: 238 };
    const targets = {
      r320: {
        grade: 320, targetKv40: null, tolerancePct: 5, minVi: 120, maxAnilinePoint: null, maxPolymerFraction: null,
        maxPourPoint: null, minFlashPoint: null, additive: null, bounds: {}, objective: 'cost' as const, referenceRecipeId: null, minInBandProbability: null,
      },
    };
    renderSheet({ targets, predict: () => ({ ...prediction, properties: properties as never }) });
    expect(screen.getByTestId('release-hold').textContent).toMatch(/misses its own constraint — minimum VI: 98\.2, limit at least 120/);
  });

  it('shows a prediction failure as a message, not as numbers', () => {
    renderSheet({
      predict: () => {
        throw new Error('kv100 = 1.5 mm²/s is below 2.0 mm²/s');
      },
    });
    expect(screen.getAllByRole('alert').some((a) => /cannot be predicted.*below 2\.0/.test(a.textContent ?? ''))).toBe(true);
    expect(screen.getByTestId('release-hold').textContent).toMatch(/cannot be predicted/);
  });

  it('lets the operator edit and restore the blending instructions', () => {
    renderSheet();
    expect(screen.getByText(/Heat to 50–65 °C/)).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Edit instructions' }));
    const box = screen.getByLabelText('Instructions, one step per line');
    fireEvent.change(box, { target: { value: 'Charge HV.\nHeat to 55 °C.' } });
    fireEvent.click(screen.getByRole('button', { name: 'Done editing' }));
    expect(screen.getByText('Heat to 55 °C.')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Restore default instructions' }));
    expect(screen.getByText(/Heat to 50–65 °C/)).toBeTruthy();
  });

  it('carries the cautions and sign-off lines', () => {
    renderSheet();
    expect(screen.getByText(/Laboratory confirmation of every release property is required/)).toBeTruthy();
    expect(screen.getByText(/safety data sheet of each component/)).toBeTruthy();
    expect(screen.getByText('Released by')).toBeTruthy();
  });

  it('prints and exports the component table as CSV without prices on the plant copy', () => {
    const onPrint = vi.fn();
    const onExportCsv = vi.fn();
    renderSheet({ onPrint, onExportCsv });
    fireEvent.change(screen.getByLabelText('Batch / lot no.'), { target: { value: 'L-0042' } });
    fireEvent.click(screen.getByRole('button', { name: 'Print' }));
    expect(onPrint).toHaveBeenCalledOnce();
    fireEvent.click(screen.getByRole('button', { name: /Export component table/ }));
    const [csv, name] = onExportCsv.mock.calls[0]! as [string, string];
    expect(name).toBe('blend-sheet_Invented-Gear-320_rev4_L-0042.csv');
    const lines = csv.split('\r\n');
    expect(lines[0]).toBe('Charge order,Code,Name,Category,Mass %,Volume %,kg,Litres at 15 °C,Running total kg');
    expect(lines[1]).toMatch(/^1,HV,Invented stock hv,Group II,68\.00,/);
    expect(lines.at(-1)).toMatch(/^,TOTAL,,,100\.00,100\.00,1000\.0,/);
    expect(csv).not.toMatch(/Price/);
  });

  it('a sheet on hold exports with the hold as the file’s first line and in its name, as it prints with it (s25); before, its CSV read as a releasable table', () => {
    const onExportCsv = vi.fn();
    renderSheet({ recipes: [{ ...recipe, status: 'draft', approvedAt: null }], onExportCsv });
    const button = screen.getByRole('button', { name: /Export component table/ });
    expect(button.textContent).toBe('Export component table (CSV) — HOLD — not for release');
    fireEvent.click(button);
    const [csv, name] = onExportCsv.mock.calls[0]! as [string, string];
    expect(name).toBe('blend-sheet_Invented-Gear-320_rev4_ON-HOLD.csv');
    const lines = csv.split('\r\n');
    expect(lines[0]).toBe('Charge order,Code,Name,Category,Mass %,Volume %,kg,Litres at 15 °C,Running total kg');
    expect(lines[1]).toMatch(/^,HOLD,"?HOLD — not for release: .*draft/);
    expect(lines[2]).toMatch(/^1,HV,/);
  });

  it('explains when there is no recipe', () => {
    renderSheet({ recipes: [], recipeId: null });
    expect(screen.getByText(/There is no recipe yet/)).toBeTruthy();
  });
});

describe('csv helpers', () => {
  it('quotes fields that need it and names files safely', () => {
    expect(toCsv([{ a: 'x,y', b: 'plain' }])).toBe('a,b\r\n"x,y",plain');
    expect(csvFileName('VG 320 / new', 2, '')).toBe('blend-sheet_VG-320-new_rev2.csv');
  });

  it('writes an unchanged line of the "Change from revision" table as a signed zero, like its neighbours (s25 walk)', () => {
    // Before: "0" beside "+3.00" and "−3.00". Shares invented (formatting only, common practice (no source)).
    const earlier: Recipe = {
      ...recipe,
      id: 'r320-r3',
      revision: 3,
      status: 'superseded',
      lines: [
        { componentId: 'n150', massFraction: 0.27 },
        { componentId: 'hv', massFraction: 0.71 },
        { componentId: 'add', massFraction: 0.02 },
      ],
    };
    renderSheet({ recipes: [earlier, { ...recipe, supersedes: 'r320-r3' }] });
    const table = within(screen.getByRole('region', { name: /Change from revision 3/ })).getByRole('table');
    const cells = within(table)
      .getAllByRole('row')
      .slice(1)
      .map((r) => within(r).getAllByRole('cell').map((c) => c.textContent));
    expect(cells).toContainEqual(['2.00', '2.00', '±0.00']);
    expect(cells).toContainEqual(['27.00', '30.00', '+3.00']);
    expect(cells).toContainEqual(['71.00', '68.00', '−3.00']);
  });
});
