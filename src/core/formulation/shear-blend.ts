/**
 * Blend viscosity after permanent shear of its polymer components — is the blend still in grade?
 *
 * ## What `Component.shearLossPct` means here
 * The KRL test (ISO 26422 / CEC L-45) measures the permanent loss of ν100 of an **oil**, not of a
 * polymer: loss % = 100·(ν100,before − ν100,after)/ν100,before (check-values.md S1). Blendbench
 * therefore reads a polymer's `shearLossPct` as: *the KRL loss of ν100 of a gear-oil blend whose
 * thickening comes from that polymer* — the figure a supplier or laboratory quotes for the polymer
 * in a typical blend — and takes it as transferable to the blend at hand (an assumption; the loss
 * really depends on the treat rate and the base fluid).
 *
 * ISO 26422 allows the loss to be measured at 40 °C as well: a polymer's `shearLoss40Pct` is used
 * directly at 40 °C (steps 1–3 run at 40 °C for it), and carried to 100 °C by step 4 when no ν100
 * loss is stated. With both stated, each temperature uses its own measurement.
 *
 * With the D7152 Wright method the basis weights cᵢ = 1/(ρᵢBᵢ) use the polymer's unsheared slope, so
 * the blend's recomputed loss matches the stated one to a fraction of a per cent rather than exactly.
 *
 * ## From ν100 to ν40 (the grade is defined at 40 °C)
 * Following the better of the two assumptions in the domain doc (§7), the shear acts on the
 * polymer, not on the base fluid:
 *
 * 1. Share of the thickening. In the mixing rule's linear coordinate X (VBN for Refutas, log-log
 *    for ASTM D7152) with weights cᵢ (1 for mass basis, 1/ρᵢ for volume basis), polymer p lifts the
 *    blend above its non-polymer remainder by tₚ = cₚwₚ·max(X100ₚ − X100_rest, 0); its share is
 *    sₚ = tₚ/Σ t. With one polymer sₚ = 1.
 * 2. Blend loss at 100 °C: L = Σ sₚ·Lₚ [%]; target ν100′ = ν100·(1 − L/100).
 * 3. Each polymer's effective ν100 is lowered so that the blend reaches ν100′ exactly, the total
 *    drop ΔS = C·(X(ν100) − X(ν100′)), C = Σ cᵢwᵢ, split between polymers in proportion to sₚ·Lₚ:
 *    X100ₚ′ = X100ₚ − ΔS·(sₚLₚ/Σ s·L)/(cₚwₚ).
 * 4. Shear removes the same FRACTION of each polymer's thickening at 40 °C as at 100 °C, measured in
 *    the mixing rule's own coordinate above the non-polymer remainder:
 *      fₚ = (X100ₚ′ − X100_rest)/(X100ₚ − X100_rest),   X40ₚ′ = X40_rest + fₚ·(X40ₚ − X40_rest).
 * 5. The blend's ν40′ is recomputed with the same mixing rule, and checked against the ISO 3448 band.
 *
 * Why step 4 and not another carry-over: it leaves the blend's VI almost unchanged or slightly
 * lower after shear, as observed for sheared polymer-thickened oils (common practice, no source),
 * and it loses a little more than the simple same-relative-loss rule at 40 °C, so the grade check
 * errs on the safe side. Shifting the polymer's ASTM D341 line in parallel was tried and rejected:
 * it makes the VI rise after shear. Keeping the polymer's own relative loss equal at both
 * temperatures was rejected too: it drops the VI by 10–30 points for heavy losses.
 *
 * The simpler assumption (same relative loss at 40 °C as at 100 °C) is reported alongside for
 * comparison. Both are estimates: laboratory shear testing of the finished blend is the proof.
 */
import type { Component, RecipeLine } from './model';
import type { BlendMethod } from '../blending/blend-viscosity';
import { blendKv40Kv100 } from '../blending/blend-viscosity';
import { blendCoordinates } from '../solver/coordinates';
import { resolveBlendParts } from './blend-properties';
import { BlendbenchInputError, ViscosityOutOfRangeError, assertFinite } from '../errors';
import { isInGrade, isoViscosityGrade } from '../viscosity/iso-grades';
import { VI_MIN_KV100, viscosityIndex } from '../viscosity/viscosity-index';

/** The stated assumption, for display beside the result. */
export const SHEAR_ASSUMPTION =
  "Each polymer's shear loss is read as the KRL loss (ISO 26422 / CEC L-45) of ν100 — or of ν40 where measured — " +
  "of a blend thickened by that polymer, applied in proportion to its share of this blend's thickening. The " +
  "polymer's effective viscosity is lowered until the blend loses that much at that temperature; where only one " +
  'temperature is measured, the same fraction of its thickening is removed at the other, and the blend is ' +
  'recomputed with the same mixing rule. An estimate: shear-test the finished blend.';

/** Indicative status of the VI after shear (it follows the carry-over assumption, not a measurement). */
export const VI_AFTER_SHEAR_NOTE =
  'Indicative only: the VI after shear follows from the carry-over assumption between 40 and 100 °C, not from ' +
  'a measurement; over random polymer and base-stock pairs it moves by roughly −24 to +16 points (audit of this ' +
  'model, issue 13). Measure ν40 and ν100 after the shear test.';

/** At which temperature(s) the polymers' losses were stated: ν100 (KRL as usual), ν40, or both. */
export type ShearStatedAt = '100' | '40' | 'both';

export interface ShearedPolymer {
  componentId: string;
  /** Stated KRL loss of ν100 Lₚ [%] (0 when only a ν40 loss is stated). */
  shearLossPct: number;
  /** Stated loss of ν40 [%], null when not measured. */
  shearLoss40Pct: number | null;
  /** Share sₚ of the blend's thickening at 100 °C (0–1). */
  share: number;
  /** Effective ν40, ν100 after shear [mm²/s]. */
  kv40After: number;
  kv100After: number;
}

export interface BlendAfterShear {
  method: BlendMethod;
  /** Grade checked (given, or the grade holding ν40 before shear; null between grades). */
  grade: number | null;
  kv40Before: number;
  kv100Before: number;
  kv40After: number;
  kv100After: number;
  /** Resulting loss of the blend's ν100 [%] (= the KRL figure applied when losses are stated at 100 °C). */
  lossKv100Pct: number;
  /** Resulting loss of ν40 [%] (= the stated ν40 figure when losses are stated at 40 °C). */
  lossKv40Pct: number;
  /** Where the polymers' losses were measured. */
  statedAt: ShearStatedAt;
  /**
   * ν40 under the simpler assumption (same relative loss as at 100 °C) [mm²/s]; null when a ν40 loss
   * was measured (no carry-over needed).
   */
  kv40AfterSameRelativeLoss: number | null;
  /** Unrounded VI after shear; null where ν100 < 2.0 mm²/s. INDICATIVE only (see `viAfterNote`). */
  viAfter: number | null;
  /** Why the VI after shear is indicative. */
  viAfterNote: string;
  inGradeBefore: boolean | null;
  inGradeAfter: boolean | null;
  polymers: ShearedPolymer[];
  /** True when no polymer with a stated loss is in the blend (after = before). */
  unchanged: boolean;
  assumption: string;
}

/**
 * Blend ν40/ν100 after permanent shear of its polymers, and whether it stays in grade.
 *
 * L = Σ sₚLₚ;  ν100′ = ν100·(1 − L/100);  polymers' X100 lowered to match, ASTM D341 slope kept;
 * ν40′ recomputed by the mixing rule (see the module comment for every step).
 *
 * @param components Library holding every component named by `lines` (calibrations are used).
 * @param lines Mass fractions wᵢ (0–1, summing to 1).
 * @param opts.method Mixing rule (default 'refutas'); opts.grade ISO VG to check (default: the grade
 *   holding ν40 before shear).
 * @returns ν40, ν100 before and after [mm²/s], losses [%], in-grade flags and per-polymer detail.
 * @throws BlendbenchInputError for an unknown component or a loss outside [0, 100); ViscosityOutOfRangeError
 *   when the stated loss exceeds what the polymers can lose (more than all their thickening).
 * @example blendAfterShear(lib, lines, { grade: 320 })
 *   // PIB-thickened VG 320 with a 2 % KRL loss → ν40 falls by a little more than 2 %, still in grade
 * Source: KRL loss definition, ISO 26422 / CEC L-45 (check-values.md S1); the carry-over to 40 °C is
 *   the assumption stated above (domain doc §7).
 */
export function blendAfterShear(
  components: readonly Component[],
  lines: readonly RecipeLine[],
  opts: { method?: BlendMethod; grade?: number | null } = {},
): BlendAfterShear {
  const fn = 'blendAfterShear';
  const method: BlendMethod = opts.method ?? 'refutas';
  const coords = blendCoordinates(method);
  const parts = resolveBlendParts(fn, components, lines).map((p) => ({
    c: p.component,
    w: p.line.massFraction,
    kv40: p.kv40,
    kv100: p.kv100,
  }));
  const toBlendParts = (kvs: { kv40: number; kv100: number }[]) =>
    parts.map((p, i) => ({ massFraction: p.w, density15: p.c.density15, kv40: kvs[i]!.kv40, kv100: kvs[i]!.kv100 }));
  const before = blendKv40Kv100(method, toBlendParts(parts));

  const grade = opts.grade ?? isoViscosityGrade(before.kv40);
  const inGrade = (kv40: number): boolean | null => (grade === null ? null : isInGrade(kv40, grade));

  // Polymers with a stated loss at 100 °C (shearLossPct) and/or at 40 °C (shearLoss40Pct).
  const weight = (p: (typeof parts)[number]): number => coords.basisWeight(p.kv40, p.kv100, p.c.density15) * p.w;
  const statedLoss = (p: (typeof parts)[number], field: 'shearLossPct' | 'shearLoss40Pct'): number => {
    const L = p.c[field] ?? 0;
    assertFinite(fn, `${p.c.id}.${field}`, L);
    if (L < 0 || L >= 100) {
      throw new BlendbenchInputError(
        `${p.c.id}.${field}`,
        L,
        `${fn}: ${field === 'shearLossPct' ? 'the ν100 shear loss' : 'the ν40 shear loss'} of ${p.c.code} = ${L} %; a permanent loss must lie in [0, 100)`,
      );
    }
    return L;
  };
  const loss100 = parts.map((p) => (p.c.category === 'polymer' && p.w > 0 ? statedLoss(p, 'shearLossPct') : 0));
  const loss40 = parts.map((p) => (p.c.category === 'polymer' && p.w > 0 ? statedLoss(p, 'shearLoss40Pct') : 0));
  const polyIdx: number[] = [];
  parts.forEach((_p, i) => {
    if (loss100[i]! > 0 || loss40[i]! > 0) polyIdx.push(i);
  });
  const statedAt: ShearStatedAt =
    polyIdx.some((i) => loss100[i]! > 0) && polyIdx.some((i) => loss40[i]! > 0)
      ? 'both'
      : polyIdx.some((i) => loss40[i]! > 0)
        ? '40'
        : '100';

  const unchangedResult = (): BlendAfterShear => ({
    method,
    grade,
    kv40Before: before.kv40,
    kv100Before: before.kv100,
    kv40After: before.kv40,
    kv100After: before.kv100,
    lossKv100Pct: 0,
    lossKv40Pct: 0,
    statedAt,
    kv40AfterSameRelativeLoss: before.kv40,
    viAfter: before.kv100 >= VI_MIN_KV100 ? viscosityIndex(before.kv40, before.kv100) : null,
    viAfterNote: VI_AFTER_SHEAR_NOTE,
    inGradeBefore: inGrade(before.kv40),
    inGradeAfter: inGrade(before.kv40),
    polymers: [],
    unchanged: true,
    assumption: SHEAR_ASSUMPTION,
  });
  if (polyIdx.length === 0) return unchangedResult();

  // The non-polymer remainder in the rule's coordinate at each temperature.
  const isPolymer = (i: number) => parts[i]!.c.category === 'polymer' && parts[i]!.w > 0;
  let restW = 0;
  let restX100 = 0;
  let restX40 = 0;
  parts.forEach((p, i) => {
    if (isPolymer(i) || !(p.w > 0)) return;
    restW += weight(p);
    restX100 += weight(p) * coords.toX(p.kv100);
    restX40 += weight(p) * coords.toX(p.kv40);
  });
  if (!(restW > 0)) {
    throw new BlendbenchInputError(
      'lines',
      lines,
      `${fn}: the blend holds only polymers; shear is assessed against a non-polymer base fluid`,
    );
  }
  const rest = { 40: restX40 / restW, 100: restX100 / restW } as const;
  const xOf = (i: number, t: 40 | 100): number => coords.toX(t === 40 ? parts[i]!.kv40 : parts[i]!.kv100);
  const C = parts.reduce((s, p) => s + weight(p), 0);

  // Steps 1–3 at one temperature t: shares of the thickening at t, the blend loss L_t = Σ s·L, and
  // each polymer's X lowered so the blend reaches ν_t·(1 − L_t/100).
  const lowerAt = (t: 40 | 100, loss: readonly number[]): { x: Map<number, number>; L: number; share: number[] } => {
    const thick = parts.map((p, i) => (isPolymer(i) ? weight(p) * Math.max(xOf(i, t) - rest[t], 0) : 0));
    const totalThick = thick.reduce((s, v) => s + v, 0);
    const x = new Map<number, number>();
    if (!(totalThick > 0)) return { x, L: 0, share: thick.map(() => 0) }; // polymers thinner than the base fluid
    const share = thick.map((v) => v / totalThick);
    const idx = polyIdx.filter((i) => loss[i]! > 0);
    const L = idx.reduce((s, i) => s + share[i]! * loss[i]!, 0);
    if (!(L > 0)) return { x, L: 0, share };
    const kvBefore = t === 40 ? before.kv40 : before.kv100;
    const dS = C * (coords.toX(kvBefore) - coords.toX(kvBefore * (1 - L / 100)));
    for (const i of idx) x.set(i, xOf(i, t) - (dS * ((share[i]! * loss[i]!) / L)) / weight(parts[i]!));
    return { x, L, share };
  };
  // Steps 1–5 for given loss scales k (1 for every rule but Wright, see below).
  const shearWith = (k100: number, k40: number) => {
    const at100 = lowerAt(100, loss100.map((l) => l * k100));
    const at40 = lowerAt(40, loss40.map((l) => l * k40));

    // Step 4: where a polymer's loss is stated at one temperature only, the same fraction of its
    // thickening is removed at the other; where both are stated, each is used as measured.
    const after = parts.map((p) => ({ kv40: p.kv40, kv100: p.kv100 }));
    const polymers: ShearedPolymer[] = [];
    const kept = (xNew: number, i: number, t: 40 | 100): number => {
      const span = xOf(i, t) - rest[t];
      return span > 0 ? (xNew - rest[t]) / span : 1;
    };
    for (const i of polyIdx) {
      const p = parts[i]!;
      let x100n = at100.x.get(i);
      let x40n = at40.x.get(i);
      let f = 1;
      if (x100n !== undefined) f = Math.min(f, kept(x100n, i, 100));
      if (x40n !== undefined) f = Math.min(f, kept(x40n, i, 40));
      if (x100n !== undefined && x40n === undefined) x40n = rest[40] + kept(x100n, i, 100) * (xOf(i, 40) - rest[40]);
      if (x40n !== undefined && x100n === undefined) x100n = rest[100] + kept(x40n, i, 40) * (xOf(i, 100) - rest[100]);
      let kv100p = Number.NaN;
      let kv40p = Number.NaN;
      if (f >= 0 && x100n !== undefined && x40n !== undefined) {
        try {
          kv100p = coords.toKv(x100n);
          kv40p = coords.toKv(x40n);
        } catch {
          kv100p = Number.NaN;
        }
      }
      if (!(f >= 0) || !(kv100p >= 2) || !(kv40p > kv100p)) {
        const field = loss100[i]! > 0 ? 'shearLossPct' : 'shearLoss40Pct';
        const L = loss100[i]! > 0 ? at100.L : at40.L;
        throw new ViscosityOutOfRangeError(
          `${p.c.id}.${field}`,
          loss100[i]! > 0 ? loss100[i]! : loss40[i]!,
          `${fn}: a ${L.toFixed(1)} % loss of the blend's ${field === 'shearLossPct' ? 'ν100' : 'ν40'} is more than ` +
            `${p.c.code} at ${(100 * p.w).toPrecision(3)} % can lose; check the stated shear loss`,
        );
      }
      after[i] = { kv40: kv40p, kv100: kv100p };
      polymers.push({
        componentId: p.c.id,
        shearLossPct: loss100[i]!,
        shearLoss40Pct: loss40[i]! > 0 ? loss40[i]! : null,
        share: loss100[i]! > 0 ? at100.share[i]! : at40.share[i]!,
        kv40After: kv40p,
        kv100After: kv100p,
      });
    }
    const sheared = blendKv40Kv100(method, toBlendParts(after));
    return { at100, at40, polymers, sheared };
  };
  let run = shearWith(1, 1);
  let k100 = 1;
  let k40 = 1;
  if (method === 'd7152-wright') {
    // Wright weights 1/(ρB) change with the polymer's sheared slope, so steps 1–3 overshoot a little:
    // rescale the stated losses until the recomputed blend loses what was stated (fixed point, a few steps).
    for (let it = 0; it < 40; it++) {
      const m100 = (100 * (before.kv100 - run.sheared.kv100)) / before.kv100;
      const m40 = (100 * (before.kv40 - run.sheared.kv40)) / before.kv40;
      const t100 = run.at100.L / k100;
      const t40 = run.at40.L / k40;
      const ok100 = !(t100 > 0) || Math.abs(m100 - t100) <= 1e-9 * t100;
      const ok40 = !(t40 > 0) || Math.abs(m40 - t40) <= 1e-9 * t40;
      if (ok100 && ok40) break;
      if (t100 > 0 && m100 > 0) k100 *= t100 / m100;
      if (t40 > 0 && m40 > 0) k40 *= t40 / m40;
      run = shearWith(k100, k40);
    }
  }
  const { polymers, sheared } = run;
  const L = run.at100.L / k100; // the stated blend loss of ν100 (unscaled)

  return {
    method,
    grade,
    kv40Before: before.kv40,
    kv100Before: before.kv100,
    kv40After: sheared.kv40,
    kv100After: sheared.kv100,
    lossKv100Pct: (100 * (before.kv100 - sheared.kv100)) / before.kv100,
    lossKv40Pct: (100 * (before.kv40 - sheared.kv40)) / before.kv40,
    statedAt,
    kv40AfterSameRelativeLoss: statedAt === '100' ? before.kv40 * (1 - L / 100) : null,
    viAfter: sheared.kv100 >= VI_MIN_KV100 && sheared.kv100 < sheared.kv40 ? viscosityIndex(sheared.kv40, sheared.kv100) : null,
    viAfterNote: VI_AFTER_SHEAR_NOTE,
    inGradeBefore: inGrade(before.kv40),
    inGradeAfter: inGrade(sheared.kv40),
    polymers,
    unchanged: false,
    assumption: SHEAR_ASSUMPTION,
  };
}
