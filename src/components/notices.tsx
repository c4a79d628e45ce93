/** Shared notices: the laboratory caution, the invented-demo label, status messages. */
import type { ReactNode } from 'react';
import type { PersistentStorageState } from '../state/persistence';
import { BLEND_METHOD_LABEL, type BlendMethod } from '../core/blending/blend-viscosity';
import { D341_FORM_SHORT, type D341Form } from '../core/viscosity/viscosity-temperature';

/**
 * The full caution, where predictions are printed (the app frame prints it on every screen's paper
 * copy; the blend sheet prints its own, longer list).
 */
export function CautionBanner({ className = '' }: { className?: string }) {
  return (
    <p className={`caution ${className}`} role="note" aria-label="Caution">
      <strong>Estimates only.</strong> Predicted properties require laboratory confirmation before release. Safety data
      sheets, site procedures and local regulations govern handling; this tool does not replace them.
    </p>
  );
}

/** The one persistent, unobtrusive caution in the app frame (on screen; the printout has the full text). */
export function StandingCaution() {
  return (
    <p className="standing-caution" role="note" aria-label="Caution">
      Predictions are estimates: laboratory confirmation is required before release.
    </p>
  );
}

/**
 * What Blendbench says about persistent storage, for the banner and for Settings alike (one
 * wording per state, so the two can never disagree). `atRisk`: the browser may clear saved work.
 */
export function persistentStorageText(state: PersistentStorageState): { atRisk: boolean; text: string } {
  switch (state) {
    case 'granted':
      return { atRisk: false, text: 'Persistent storage granted: the browser will not clear saved work to free space.' };
    case 'refused':
      return {
        atRisk: true,
        text: 'Persistent storage refused: the browser may clear the saved library and recipes when space runs low. Export a backup regularly (Settings → Export everything).',
      };
    case 'unsupported':
      return {
        atRisk: true,
        text: 'Persistent storage is not offered by this browser: it may clear the saved library and recipes when space runs low. Export a backup regularly (Settings → Export everything).',
      };
    default:
      return { atRisk: false, text: 'Persistent storage not asked for yet.' };
  }
}

/**
 * The blend-viscosity method a result was predicted with, named in full beside the result (issue 13:
 * every result names its method — D7152 Wright method, D7152 ASTM Blending Method, or Refutas, which
 * is not a D7152 method). One wording for every screen and printout.
 */
export function methodText(method: BlendMethod): string {
  return `Blend viscosity method: ${BLEND_METHOD_LABEL[method]}.`;
}

/**
 * The form of the ASTM D341 line a viscosity at temperature was read off (Settings), named beside the
 * result: the full D341-20 Z, or the simple Z = ν + 0.7.
 */
export function d341FormText(form: D341Form): string {
  return `Viscosity at other temperatures: ${D341_FORM_SHORT[form]} line through ν40 and ν100.`;
}

/**
 * {@link methodText} as a small note, for screens and printouts alike; with `d341Form`, also the form
 * of the D341 line behind the viscosities at other temperatures ({@link d341FormText}).
 */
export function MethodNote({ method, d341Form, className = '' }: { method: BlendMethod; d341Form?: D341Form; className?: string }) {
  return (
    <p className={`method-note ${className}`} data-testid="method-note">
      {methodText(method)}
      {d341Form ? ` ${d341FormText(d341Form)}` : ''}
    </p>
  );
}

/** A small tag saying the data shown are invented demo data. */
export function DemoTag({ children }: { children?: ReactNode }) {
  return <span className="demo-tag">{children ?? 'Invented demo data'}</span>;
}

export function Notice({
  tone,
  title,
  children,
  actions,
}: {
  tone: 'error' | 'warning' | 'info' | 'success';
  title?: string;
  children: ReactNode;
  actions?: ReactNode;
}) {
  return (
    <div className={`notice notice-${tone}`} role={tone === 'error' ? 'alert' : 'status'}>
      {title ? <strong className="notice-title">{title}</strong> : null}
      <div className="notice-body">{children}</div>
      {actions ? <div className="notice-actions">{actions}</div> : null}
    </div>
  );
}

/**
 * A short message after an action, with Undo (when the action can be undone) and Dismiss: the
 * pattern of the Stocks and Recipes screens.
 */
export function ActionNotice({
  tone,
  text,
  canUndo,
  onUndo,
  onDismiss,
}: {
  tone: 'error' | 'warning' | 'info' | 'success';
  text: ReactNode;
  canUndo: boolean;
  onUndo: () => void;
  onDismiss: () => void;
}) {
  return (
    <Notice
      tone={tone}
      actions={
        <>
          {canUndo ? (
            <button
              type="button"
              onClick={() => {
                onUndo();
                onDismiss();
              }}
            >
              Undo
            </button>
          ) : null}
          <button type="button" onClick={onDismiss}>
            Dismiss
          </button>
        </>
      }
    >
      {text}
    </Notice>
  );
}
