import { Component, type ReactNode } from 'react';

interface Props {
  /** Changes when the screen changes, so a crashed screen can be left. */
  resetKey: string;
  children: ReactNode;
}

/** Keeps one screen's crash from blanking the app; says what happened in plain words. */
export class ErrorBoundary extends Component<Props, { error: Error | null; key: string }> {
  override state = { error: null as Error | null, key: this.props.resetKey };

  static getDerivedStateFromError(error: Error) {
    return { error };
  }

  static getDerivedStateFromProps(props: Props, state: { error: Error | null; key: string }) {
    return props.resetKey !== state.key ? { error: null, key: props.resetKey } : null;
  }

  override render() {
    if (this.state.error) {
      return (
        <div className="notice notice-error" role="alert">
          <strong className="notice-title">This screen stopped with an error.</strong>
          <div className="notice-body">
            {this.state.error.message}. Your saved work is not affected; choose another screen or reload the page.
          </div>
        </div>
      );
    }
    return this.props.children;
  }
}
