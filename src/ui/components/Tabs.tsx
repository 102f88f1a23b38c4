/** Accessible tabs (arrow keys move between tabs). */
import { type ReactNode, useEffect, useId, useState } from "react";

export interface TabDef {
  id: string;
  label: string;
  render: () => ReactNode;
}

export function Tabs(props: {
  tabs: TabDef[];
  label: string;
  initial?: string;
  testId?: string;
  /** Brings a tab forward when it changes (seq tells a repeated request from an old one). */
  request?: { id: string; seq: number } | null;
}) {
  const [active, setActive] = useState(props.initial ?? props.tabs[0].id);
  const { request } = props;
  useEffect(() => {
    if (request) setActive(request.id);
  }, [request]);
  const base = useId();
  const current = props.tabs.find((t) => t.id === active) ?? props.tabs[0];
  return (
    <div className="tabs" data-testid={props.testId}>
      <div role="tablist" aria-label={props.label} className="tablist">
        {props.tabs.map((t, i) => (
          <button
            key={t.id}
            type="button"
            role="tab"
            id={`${base}-${t.id}`}
            aria-selected={t.id === current.id}
            aria-controls={`${base}-${t.id}-panel`}
            tabIndex={t.id === current.id ? 0 : -1}
            data-testid={`tab-${t.id}`}
            onClick={() => setActive(t.id)}
            onKeyDown={(e) => {
              const d = e.key === "ArrowRight" ? 1 : e.key === "ArrowLeft" ? -1 : 0;
              if (!d) return;
              const next = props.tabs[(i + d + props.tabs.length) % props.tabs.length];
              setActive(next.id);
              document.getElementById(`${base}-${next.id}`)?.focus();
            }}
          >
            {t.label}
          </button>
        ))}
      </div>
      <div
        role="tabpanel"
        id={`${base}-${current.id}-panel`}
        aria-labelledby={`${base}-${current.id}`}
        className="tabpanel"
      >
        {current.render()}
      </div>
    </div>
  );
}
