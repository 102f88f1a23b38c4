/** The message stack: errors, warnings and notes, each dismissable; text only (never HTML). */
import { useSession } from "../session";

export function Messages() {
  const messages = useSession((s) => s.messages);
  const dismiss = useSession((s) => s.dismiss);
  if (messages.length === 0) return null;
  return (
    <div className="messages" aria-live="polite">
      {messages.map((m) => (
        <div
          key={m.id}
          className={`message message-${m.kind}`}
          role={m.kind === "error" ? "alert" : "status"}
        >
          <div className="message-text" data-testid={`message-${m.kind}`}>
            {m.text}
          </div>
          {m.details && m.details.length > 0 && (
            <ul className="message-details">
              {m.details.slice(0, 12).map((d) => (
                <li key={d}>{d}</li>
              ))}
              {m.details.length > 12 && <li>… and {m.details.length - 12} more</li>}
            </ul>
          )}
          <button
            type="button"
            className="message-close"
            aria-label="Dismiss message"
            onClick={() => dismiss(m.id)}
          >
            ×
          </button>
        </div>
      ))}
    </div>
  );
}
