/** The page's message area: what happened, in plain words (always text nodes). */
import { useEffect } from 'react';
import { messageDismiss } from '../state/actionsCore';
import { useBench } from '../state/store';

/** Info messages fade after this long, ms; warnings and errors stay until dismissed. */
const INFO_LIFETIME_MS = 12_000;

export function MessageArea() {
  const messages = useBench((s) => s.messages);
  useEffect(() => {
    const timers = messages.filter((m) => m.level === 'info').map((m) => setTimeout(() => messageDismiss(m.id), INFO_LIFETIME_MS));
    return () => timers.forEach(clearTimeout);
  }, [messages]);
  return (
    <div className="messages" aria-live="polite" aria-label="Messages" data-testid="messages">
      {[...messages].reverse().map((m) => (
        <div key={m.id} className={`message ${m.level}`} role={m.level === 'error' ? 'alert' : 'status'}>
          <span className="message-level">{m.level === 'error' ? 'Error' : m.level === 'warning' ? 'Note' : 'Info'}</span>
          <span className="message-text">{m.text}</span>
          <button type="button" className="icon" aria-label="Dismiss message" onClick={() => messageDismiss(m.id)}>
            ✕
          </button>
        </div>
      ))}
    </div>
  );
}
