/** Shared notices: the laboratory caution, the invented-demo label, status messages. */
import type { ReactNode } from 'react';

/** The standing caution: shown wherever predicted properties are. */
export function CautionBanner({ compact = false }: { compact?: boolean }) {
  return (
    <p className={`caution ${compact ? 'caution-compact' : ''}`} role="note" aria-label="Caution">
      <strong>Estimates only.</strong> Predicted properties require laboratory confirmation before release.
      {compact ? null : (
        <>
          {' '}
          Safety data sheets, site procedures and local regulations govern handling; this tool does not replace them.
        </>
      )}
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
