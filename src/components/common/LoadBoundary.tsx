import { Component, type ReactNode } from "react";

/**
 * Shows `fallback` in place of its children once they throw while rendering: above all when a
 * part loaded on demand (`React.lazy`) cannot be fetched, so the rest of the island keeps working.
 */
export class LoadBoundary extends Component<{ fallback: ReactNode; children: ReactNode }, { failed: boolean }> {
  override state = { failed: false };

  static getDerivedStateFromError() {
    return { failed: true };
  }

  override render() {
    return this.state.failed ? this.props.fallback : this.props.children;
  }
}
