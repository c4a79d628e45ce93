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
  "Each polymer's shear loss is read as the KRL loss of ν100 (ISO 26422 / CEC L-45) of a blend thickened by " +
  "that polymer, applied in proportion to its share of this blend's thickening. The polymer's effective " +
  'viscosity is lowered until the blend loses that much at 100 °C; the same fraction of its thickening is ' +
  'removed at 40 °C, and ν40 is recomputed with the same mixing rule. An estimate: shear-test the finished blend.';

export interface ShearedPolymer {
  componentId: string;
  /** Stated KRL loss Lₚ [%]. */
  shearLossPct: number;
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
  /** Blend loss of ν100, L [%] (= the KRL figure applied). */
  lossKv100Pct: number;
  /** Resulting loss of ν40 [%]. */
  lossKv40Pct: number;
  /** ν40 under the simpler assumption (same relative loss as at 100 °C) [mm²/s]. */
  kv40AfterSameRelativeLoss: number;
  /** Unrounded VI after shear; null where ν100 < 2.0 mm²/s. */
  viAfter: number | null;
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

  // Polymers with a stated loss.
  const weight = (p: (typeof parts)[number]): number => (coords.massBasis ? 1 : 1 / p.c.density15) * p.w;
  const polyIdx: number[] = [];
  parts.forEach((p, i) => {
    if (p.c.category !== 'polymer' || !(p.w > 0)) return;
    const L = p.c.shearLossPct ?? 0;
    assertFinite(fn, `${p.c.id}.shearLossPct`, L);
    if (L < 0 || L >= 100) {
      throw new BlendbenchInputError(
        `${p.c.id}.shearLossPct`,
        L,
        `${fn}: shearLossPct of ${p.c.code} = ${L} %; a permanent loss must lie in [0, 100)`,
      );
    }
    if (L > 0) polyIdx.push(i);
  });

  const unchangedResult = (): BlendAfterShear => ({
    method,
    grade,
    kv40Before: before.kv40,
    kv100Before: before.kv100,
    kv40After: before.kv40,
    kv100After: before.kv100,
    lossKv100Pct: 0,
    lossKv40Pct: 0,
    kv40AfterSameRelativeLoss: before.kv40,
    viAfter: before.kv100 >= VI_MIN_KV100 ? viscosityIndex(before.kv40, before.kv100) : null,
    inGradeBefore: inGrade(before.kv40),
    inGradeAfter: inGrade(before.kv40),
    polymers: [],
    unchanged: true,
    assumption: SHEAR_ASSUMPTION,
  });
  if (polyIdx.length === 0) return unchangedResult();

  // 1. Shares of the thickening at 100 °C (every polymer in the blend counts as thickener).
  const isPolymer = (i: number) => parts[i]!.c.category === 'polymer' && parts[i]!.w > 0;
  let restW = 0;
  let restWX = 0;
  parts.forEach((p, i) => {
    if (isPolymer(i) || !(p.w > 0)) return;
    restW += weight(p);
    restWX += weight(p) * coords.toX(p.kv100);
  });
  if (!(restW > 0)) {
    throw new BlendbenchInputError(
      'lines',
      lines,
      `${fn}: the blend holds only polymers; shear is assessed against a non-polymer base fluid`,
    );
  }
  const xRest = restWX / restW;
  let restX40 = 0;
  parts.forEach((p, i) => {
    if (isPolymer(i) || !(p.w > 0)) return;
    restX40 += (weight(p) * coords.toX(p.kv40)) / restW;
  });
  const thick = parts.map((p, i) => (isPolymer(i) ? weight(p) * Math.max(coords.toX(p.kv100) - xRest, 0) : 0));
  const totalThick = thick.reduce((s, t) => s + t, 0);
  if (!(totalThick > 0)) return unchangedResult(); // polymers thinner than the base fluid thicken nothing
  const share = thick.map((t) => t / totalThick);

  // 2. Blend loss and target ν100.
  const L = polyIdx.reduce((s, i) => s + share[i]! * (parts[i]!.c.shearLossPct ?? 0), 0);
  if (!(L > 0)) return unchangedResult();
  const kv100Target = before.kv100 * (1 - L / 100);
  const C = parts.reduce((s, p) => s + weight(p), 0);
  const dS = C * (coords.toX(before.kv100) - coords.toX(kv100Target));

  // 3–4. Lower each sheared polymer's X100; remove the same fraction of its thickening at 40 °C.
  const sumSL = polyIdx.reduce((s, i) => s + share[i]! * (parts[i]!.c.shearLossPct ?? 0), 0);
  const after = parts.map((p) => ({ kv40: p.kv40, kv100: p.kv100 }));
  const polymers: ShearedPolymer[] = [];
  for (const i of polyIdx) {
    const p = parts[i]!;
    const Lp = p.c.shearLossPct ?? 0;
    const x100 = coords.toX(p.kv100);
    const xNew = x100 - (dS * ((share[i]! * Lp) / sumSL)) / weight(p);
    // Fraction of the polymer's thickening kept (step 4); below 0 the loss exceeds all of it.
    const f = (xNew - xRest) / (x100 - xRest);
    let kv100p = Number.NaN;
    let kv40p = Number.NaN;
    if (f >= 0) {
      try {
        kv100p = coords.toKv(xNew);
        kv40p = coords.toKv(restX40 + f * (coords.toX(p.kv40) - restX40));
      } catch {
        kv100p = Number.NaN;
      }
    }
    if (!(f >= 0) || !(kv100p >= 2) || !(kv40p > kv100p)) {
      throw new ViscosityOutOfRangeError(
        `${p.c.id}.shearLossPct`,
        Lp,
        `${fn}: a ${L.toFixed(1)} % loss of the blend's ν100 is more than ${p.c.code} at ${(100 * p.w).toPrecision(3)} % ` +
          'can lose; check the stated shear loss',
      );
    }
    after[i] = { kv40: kv40p, kv100: kv100p };
    polymers.push({ componentId: p.c.id, shearLossPct: Lp, share: share[i]!, kv40After: kv40p, kv100After: kv100p });
  }

  // 5. Recompute the blend.
  const sheared = blendKv40Kv100(method, toBlendParts(after));
  return {
    method,
    grade,
    kv40Before: before.kv40,
    kv100Before: before.kv100,
    kv40After: sheared.kv40,
    kv100After: sheared.kv100,
    lossKv100Pct: L,
    lossKv40Pct: (100 * (before.kv40 - sheared.kv40)) / before.kv40,
    kv40AfterSameRelativeLoss: before.kv40 * (1 - L / 100),
    viAfter: sheared.kv100 >= VI_MIN_KV100 && sheared.kv100 < sheared.kv40 ? viscosityIndex(sheared.kv40, sheared.kv100) : null,
    inGradeBefore: inGrade(before.kv40),
    inGradeAfter: inGrade(sheared.kv40),
    polymers,
    unchanged: false,
    assumption: SHEAR_ASSUMPTION,
  };
}
