/** Shared notices: the laboratory caution, the invented-demo label, status messages. */
import type { ReactNode } from 'react';
import type { PersistentStorageState } from '../state/persistence';
import { BLEND_METHOD_LABEL, type BlendMethod } from '../core/blending/blend-viscosity';

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

/** {@link methodText} as a small note, for screens and printouts alike. */
export function MethodNote({ method, className = '' }: { method: BlendMethod; className?: string }) {
  return (
    <p className={`method-note ${className}`} data-testid="method-note">
      {methodText(method)}
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
