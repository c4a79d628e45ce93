// Maps the blend prediction of the core (`predictBlend`) onto the few numbers the sheet prints.
import type { BlendProperties } from '../../core/formulation/blend-properties';
import type { SheetPrediction } from '../../core/sheet/blend-sheet';

export function toSheetPrediction(p: BlendProperties): SheetPrediction {
  return {
    kv40: p.kv40,
    kv100: p.kv100,
    reportedVi: p.reportedVi,
    density15: p.density15,
    anilinePoint: p.anilinePoint?.value ?? null,
    flashPoint: p.flashPoint,
    pourPoint: p.pourPoint,
    operating: p.kvAtOperating,
  };
}
