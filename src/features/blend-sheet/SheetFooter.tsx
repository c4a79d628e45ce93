import { BLEND_SHEET_CAUTIONS } from '../../core/sheet/blend-sheet';

/**
 * The foot of every printed plant sheet (blend sheet, correction sheet): the full cautions, then a
 * signature line for each role in `roles` (e.g. "Blended by", "QC tested by", "Released by").
 */
export function SheetFooter({ roles }: { roles: readonly string[] }) {
  return (
    // One block that a page break never splits: the sign-off never stands alone on a page.
    <div className="bs-foot">
      <section className="bs-cautions" aria-label="Cautions">
        <h3>Cautions</h3>
        <ul>
          {BLEND_SHEET_CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </section>
      <section className="bs-signoff" aria-label="Sign-off">
        {roles.map((who) => (
          <div key={who} className="bs-sign">
            <div className="bs-sign-line">
              <span className="bs-sign-role">{who}</span> (name, signature)
            </div>
            <div className="bs-sign-line">Date, time</div>
          </div>
        ))}
      </section>
    </div>
  );
}
